// The built-in demo talker: a seeded, synthetic, speech-like signal of our own, so the
// monitor shows something useful with no microphone and no recording. A source-filter
// model: a glottal pulse train (Rosenberg's pulse shape, A. E. Rosenberg, "Effect of
// glottal pulse shape on the quality of natural vowels", JASA 49, 1971) with jitter and
// shimmer, or noise for the consonants, through a cascade of four formant resonators
// (D. H. Klatt, "Software for a cascade/parallel formant synthesizer", JASA 67, 1980)
// moving between vowel targets. Syllables of 100-300 ms come in phrases with short
// gaps and longer pauses; the pitch falls across a phrase and rises on stressed
// syllables; phrase levels vary (soft passages near -40 dBov, occasional loud bursts
// whose peaks reach -6..-1 dBov), and a soft ceiling keeps every sample below
// SOFT_CEILING. A faint room noise fills the pauses.
//
// Streaming and block forms give the same samples: all randomness is drawn at syllable,
// period and sample events counted from the start of the stream, and control-rate
// updates fall on sample indices counted from the start, never from a block's start.
import { Xoshiro128 } from './random';

const TWO_PI = 2 * Math.PI;

/** Control updates (pitch, formants, envelopes) per second. */
const CONTROL_RATE = 1500;

/** Samples above SOFT_KNEE are bent smoothly towards SOFT_CEILING (float scale). */
const SOFT_KNEE = 0.5;
export const SOFT_CEILING = 0.95;

/** Output gain that puts the long-run P.56 active level near -26 dBov (tuned on seeds 1..6). */
const OUTPUT_GAIN = 0.0046;

/** Room noise in the pauses, RMS on the float scale (about -80 dBov after its lowpass at 48 kHz). */
const ROOM_NOISE_RMS = 8e-5;

// Vowel formant targets F1..F4 (Hz) and bandwidths (Hz): round figures near the adult male
// averages of G. E. Peterson and H. L. Barney, "Control methods used in a study of the
// vowels", JASA 24, 1952 (from memory), F4 added at a typical 3500 Hz.
// prettier-ignore
const VOWELS = new Float64Array([
  // F1, F2, F3, F4
  730, 1090, 2440, 3500, // a
  530, 1840, 2480, 3500, // e
  270, 2290, 3010, 3600, // i
  570, 840, 2410, 3400, // o
  300, 870, 2240, 3400, // u
  660, 1720, 2410, 3500, // ae
  520, 1190, 2390, 3450, // schwa-like
]);
const VOWEL_COUNT = VOWELS.length / 4;
const NASAL = new Float64Array([280, 1100, 2500, 3400]);
const BANDWIDTHS = new Float64Array([80, 100, 140, 200]);

// Phrase kinds and the deck they are dealt from: two soft, two loud, four at the talker's own level.
const NORMAL = 0;
const SOFT = 1;
const LOUD = 2;
const DECK = new Uint8Array([NORMAL, SOFT, LOUD, NORMAL, SOFT, NORMAL, LOUD, NORMAL]);

const enum Onset {
  None = 0,
  Plosive = 1,
  Fricative = 2,
  Nasal = 3,
}

/** A Klatt resonator y = a x + b y1 + c y2 (unity gain at 0 Hz), coefficients for F and BW. */
function resonatorCoefficients(f: number, bw: number, rate: number, into: Float64Array, at: number): void {
  const t = 1 / rate;
  const c = -Math.exp(-TWO_PI * bw * t);
  const b = 2 * Math.exp(-Math.PI * bw * t) * Math.cos(TWO_PI * f * t);
  into[at] = 1 - b - c;
  into[at + 1] = b;
  into[at + 2] = c;
}

/** Rosenberg glottal flow over one period, phase p in [0, 1): open 40 %, closing 16 %. */
function glottalFlow(p: number): number {
  const open = 0.4;
  const closing = 0.16;
  if (p < open) return 0.5 * (1 - Math.cos((Math.PI * p) / open));
  if (p < open + closing) return Math.cos((Math.PI * (p - open)) / (2 * closing));
  return 0;
}

export class DemoTalker {
  readonly rate: number;
  readonly seed: number;
  private readonly rng: Xoshiro128;
  private readonly controlPeriod: number;
  private readonly maxFormant: number;

  // Stream position and control clock.
  private n = 0;
  private untilControl = 0;

  // Segment plan: a syllable or a pause, its length and how far it has run.
  private inSyllable = false;
  private segLength = 0;
  private segAt = 0;
  // Phrase.
  private readonly deck = new Uint8Array(DECK.length);
  private deckAt = DECK.length;
  private syllablesLeft = 0;
  private syllableCount = 1;
  private syllableIndex = 0;
  private phraseGainDb = 0;
  private phraseF0 = 150;
  private rising = false;
  // Syllable.
  private onset: Onset = Onset.None;
  private onsetLength = 0;
  private vowel = 0;
  private syllableGain = 1;
  private accent = 0;
  private fricativeHz = 3000;
  private burstHz = 2000;

  // Control-rate targets, smoothed per sample or per control step.
  private voicedTarget = 0;
  private noiseTarget = 0;
  private voicedAmp = 0;
  private noiseAmp = 0;
  private readonly ampSmooth: number;
  private readonly formantSmooth: number;
  private readonly formants = new Float64Array(4);
  private readonly formantTargets = new Float64Array(4);
  private readonly tract = new Float64Array(12); // a, b, c per formant
  private readonly tractState = new Float64Array(8); // y1, y2 per formant
  private readonly fric = new Float64Array(3);
  private fricY1 = 0;
  private fricY2 = 0;
  private f0 = 150;

  // Glottal source.
  private phase = 0;
  private periodScale = 1; // jitter of the current period
  private pulseGain = 1; // shimmer of the current period
  private lastFlow = 0;

  // Noise: Box-Muller with the spare kept; room noise lowpass.
  private spare = 0;
  private hasSpare = false;
  private room = 0;
  private readonly roomPole: number;

  constructor(rate: number, seed = 1) {
    if (!(rate >= 4000) || !Number.isFinite(rate))
      throw new RangeError(`demo talker: rate must be >= 4000 (got ${rate})`);
    this.rate = rate;
    this.seed = seed;
    this.rng = new Xoshiro128(seed);
    this.controlPeriod = Math.max(1, Math.round(rate / CONTROL_RATE));
    this.maxFormant = 0.45 * rate;
    this.ampSmooth = 1 - Math.exp(-1 / (0.002 * rate));
    this.formantSmooth = 1 - Math.exp(-this.controlPeriod / (0.025 * rate));
    this.roomPole = Math.exp((-TWO_PI * 1500) / rate);
    for (let k = 0; k < 4; k++) {
      this.formants[k] = VOWELS[4 * (VOWEL_COUNT - 1) + k];
      this.formantTargets[k] = this.formants[k];
    }
    this.startPause(Math.round(0.25 * rate));
  }

  /** Samples produced since construction. */
  get position(): number {
    return this.n;
  }

  private uniform(lo: number, hi: number): number {
    return lo + (hi - lo) * this.rng.nextFloat();
  }

  private gauss(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    const r = Math.sqrt(-2 * Math.log(this.rng.nextOpenFloat()));
    const a = TWO_PI * this.rng.nextFloat();
    this.spare = r * Math.sin(a);
    this.hasSpare = true;
    return r * Math.cos(a);
  }

  private startPause(length: number): void {
    this.inSyllable = false;
    this.segLength = Math.max(1, length);
    this.segAt = 0;
  }

  /** Next phrase kind from a shuffled deck, so every stretch of DECK phrases has its share of each. */
  private drawPhraseKind(): number {
    if (this.deckAt >= DECK.length) {
      this.deck.set(DECK);
      for (let i = this.deck.length - 1; i > 0; i--) {
        const j = Math.floor(this.rng.nextFloat() * (i + 1));
        const t = this.deck[i];
        this.deck[i] = this.deck[j];
        this.deck[j] = t;
      }
      this.deckAt = 0;
    }
    return this.deck[this.deckAt++];
  }

  private startPhrase(): void {
    const kind = this.drawPhraseKind();
    if (kind === SOFT) {
      // A soft passage: an aside, near -40 dBov.
      this.phraseGainDb = this.uniform(-22, -16);
      this.syllableCount = 3 + Math.floor(this.uniform(0, 6));
    } else if (kind === LOUD) {
      // A loud burst: short and emphatic.
      this.phraseGainDb = this.uniform(9, 12);
      this.syllableCount = 1 + Math.floor(this.uniform(0, 3));
    } else {
      this.phraseGainDb = this.uniform(-6, 4);
      this.syllableCount = 3 + Math.floor(this.uniform(0, 7));
    }
    this.syllablesLeft = this.syllableCount;
    this.syllableIndex = 0;
    this.phraseF0 = this.uniform(150, 185) * (this.phraseGainDb > 5 ? 1.15 : 1);
    this.rising = this.rng.nextFloat() < 0.2;
  }

  private startSyllable(): void {
    const rate = this.rate;
    this.inSyllable = true;
    this.segLength = Math.round(this.uniform(0.1, 0.3) * rate);
    this.segAt = 0;
    const r = this.rng.nextFloat();
    this.onset = r < 0.3 ? Onset.Plosive : r < 0.5 ? Onset.Fricative : r < 0.65 ? Onset.Nasal : Onset.None;
    const share = this.onset === Onset.None ? 0 : this.uniform(0.15, 0.35);
    this.onsetLength = Math.round(share * this.segLength);
    this.vowel = Math.floor(this.uniform(0, VOWEL_COUNT));
    const stressed = this.rng.nextFloat() < 0.35;
    this.accent = stressed ? this.uniform(0.08, 0.22) : this.uniform(-0.03, 0.04);
    const progress = this.syllableIndex / this.syllableCount;
    const emphasis = this.rng.nextFloat() < 0.05 && this.phraseGainDb < 5 ? 6 : 0;
    const db = this.phraseGainDb - 4 * progress + (stressed ? 2 : -1) + this.uniform(-2, 2) + emphasis;
    this.syllableGain = Math.pow(10, db / 20);
    this.fricativeHz = Math.min(this.maxFormant, this.uniform(2500, 4200));
    this.burstHz = Math.min(this.maxFormant, this.uniform(1200, 3000));
    for (let k = 0; k < 4; k++) this.formantTargets[k] = VOWELS[4 * this.vowel + k];
  }

  private endSegment(): void {
    if (this.inSyllable) {
      this.syllablesLeft--;
      this.syllableIndex++;
      if (this.syllablesLeft > 0) {
        if (this.rng.nextFloat() < 0.5) this.startPause(Math.round(this.uniform(0.02, 0.08) * this.rate));
        else this.startSyllable();
      } else {
        const long = this.rng.nextFloat() < 0.15;
        this.startPause(Math.round(this.uniform(0.25, long ? 1.5 : 0.7) * this.rate));
      }
    } else {
      if (this.syllablesLeft <= 0) this.startPhrase();
      this.startSyllable();
    }
  }

  /** Envelope, pitch and formant targets for the current position. */
  private control(): void {
    const rate = this.rate;
    let voiced = 0;
    let noise = 0;
    if (this.inSyllable) {
      const t = this.segAt;
      const len = this.segLength;
      const g = this.syllableGain;
      const lc = this.onsetLength;
      if (t < lc) {
        const u = t / lc;
        if (this.onset === Onset.Plosive) {
          // Closure, then a short burst of noise.
          noise = u < 0.4 ? 0 : 0.6 * g * Math.exp(-(u - 0.4) * 6);
        } else if (this.onset === Onset.Fricative) {
          noise = 0.22 * g * Math.sin(Math.PI * u);
        } else if (this.onset === Onset.Nasal) {
          voiced = 0.35 * g * Math.min(1, (t / rate) * 60);
        }
      } else {
        const tv = t - lc;
        const lv = len - lc;
        const attack = Math.min(1, tv / (0.015 * rate));
        const release = Math.min(1, (len - t) / (0.04 * rate));
        voiced = g * attack * release * (1 - (0.5 * tv) / lv);
      }
      const u = t / len;
      const progress = (this.syllableIndex + u) / this.syllableCount;
      let f0 = this.phraseF0 * (1 - 0.18 * progress) * (1 + this.accent * Math.sin(Math.PI * u));
      if (this.rising && this.syllablesLeft === 1) f0 *= 1 + 0.35 * u * u;
      this.f0 = f0;
      const nasal = this.onset === Onset.Nasal && t < lc;
      for (let k = 0; k < 4; k++) {
        const target = nasal ? NASAL[k] : this.formantTargets[k];
        this.formants[k] += this.formantSmooth * (target - this.formants[k]);
      }
    }
    this.voicedTarget = voiced;
    this.noiseTarget = noise;
    for (let k = 0; k < 4; k++) {
      resonatorCoefficients(
        Math.min(this.maxFormant, this.formants[k]),
        BANDWIDTHS[k],
        rate,
        this.tract,
        3 * k,
      );
    }
    const fricHz = this.onset === Onset.Plosive ? this.burstHz : this.fricativeHz;
    resonatorCoefficients(fricHz, 900, rate, this.fric, 0);
  }

  /** Writes the next end - start samples into out[start, end). */
  fill(out: Float32Array | Float64Array, start = 0, end = out.length): void {
    const tract = this.tract;
    const st = this.tractState;
    const fric = this.fric;
    const rate = this.rate;
    const sm = this.ampSmooth;
    for (let i = start; i < end; i++) {
      if (this.segAt >= this.segLength) this.endSegment();
      if (this.untilControl === 0) {
        this.control();
        this.untilControl = this.controlPeriod;
      }
      this.untilControl--;
      this.voicedAmp += sm * (this.voicedTarget - this.voicedAmp);
      this.noiseAmp += sm * (this.noiseTarget - this.noiseAmp);

      // Glottal source: flow derivative, one period at a time with its own jitter and shimmer.
      this.phase += this.f0 / (rate * this.periodScale);
      if (this.phase >= 1) {
        this.phase -= 1;
        this.periodScale = 1 + 0.01 * (this.rng.nextFloat() - 0.5);
        this.pulseGain = 1 + 0.08 * (this.rng.nextFloat() - 0.5);
      }
      const flow = glottalFlow(this.phase);
      const pulse = (flow - this.lastFlow) * (rate / 100) * this.pulseGain;
      this.lastFlow = flow;
      const w = this.gauss();
      let x = this.voicedAmp * (pulse + 0.02 * w);
      for (let k = 0; k < 4; k++) {
        const y = tract[3 * k] * x + tract[3 * k + 1] * st[2 * k] + tract[3 * k + 2] * st[2 * k + 1];
        st[2 * k + 1] = st[2 * k];
        st[2 * k] = y;
        x = y;
      }
      // Consonant noise in parallel; the resonator's unity gain at 0 Hz would let lows through,
      // so it takes the difference of its input (a zero at 0 Hz).
      const fn = this.noiseAmp * w;
      const fy = fric[0] * fn + fric[1] * this.fricY1 + fric[2] * this.fricY2;
      const fOut = fy - this.fricY1;
      this.fricY2 = this.fricY1;
      this.fricY1 = fy;
      this.room = this.roomPole * this.room + (1 - this.roomPole) * w;

      let s = OUTPUT_GAIN * (x + 2 * fOut) + ROOM_NOISE_RMS * 4 * this.room;
      const m = Math.abs(s);
      if (m > SOFT_KNEE) {
        const bent =
          SOFT_KNEE + (SOFT_CEILING - SOFT_KNEE) * Math.tanh((m - SOFT_KNEE) / (SOFT_CEILING - SOFT_KNEE));
        s = s < 0 ? -bent : bent;
      }
      out[i] = s;
      this.segAt++;
      this.n++;
    }
  }
}

/** `seconds` of the demo talker at `rate` for a seed: the streaming form run over one block. */
export function renderDemoTalker(rate: number, seconds: number, seed = 1): Float32Array<ArrayBuffer> {
  if (!(seconds >= 0) || !Number.isFinite(seconds))
    throw new RangeError(`seconds must be >= 0 (got ${seconds})`);
  const out = new Float32Array(Math.round(rate * seconds));
  new DemoTalker(rate, seed).fill(out);
  return out;
}
