// `quantiscope analyze` on one hour of 48 kHz mono audio with two channels
// (g711-mu and g711-a: channel path to 8 kHz and every accumulator), as a real-time
// factor, against the bare decode loop timed in the same run.
//
// The hour is a real temporary file: 16-bit PCM WAV (346 MB) made of a seeded 10 s
// speech-like buffer repeated 360 times (the cost does not depend on the content).
// The analyses run the bundled command line itself (dist/cli/quantiscope.cjs, as
// `npm run bench` builds it) in a child process, so file reading, start-up and the
// workers are counted as a user meets them:
//   one core     analyze hour.wav --jobs 1                 (3600 s of audio)
//   two workers  analyze hour.wav hour.wav --jobs 2        (7200 s of audio)
// The reference, the bare decode loop, reads the same file in 1 MiB pieces and turns
// the samples into floats (core/io decodeChannel, the reader's own decoder), nothing
// else. The third figure is the speed-up of two workers over one core.
import { execFileSync } from 'node:child_process';
import { closeSync, existsSync, mkdtempSync, openSync, readSync, rmSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { decodeChannel, pcm16Bytes, wavHeader } from '../../core/io/index';
import { registerFigure } from './harness';
import { speechLikeInt16 } from './signals';

const RATE = 48000;
const PIECE_SECONDS = 10;
const PIECES = 360;
const SECONDS = PIECE_SECONDS * PIECES;
const HEADER = 44;

interface Measured {
  decode: number;
  one: number;
  two: number;
}

let measured: Measured | null = null;

function cliScript(): string {
  const script = fileURLToPath(new URL('../cli/quantiscope.cjs', import.meta.url));
  if (!existsSync(script))
    throw new Error(`bench: the bundled command line is missing (${script}); run the build first`);
  return script;
}

function writeHour(file: string): void {
  const piece = pcm16Bytes(
    speechLikeInt16(PIECE_SECONDS * RATE, 600),
    new Uint8Array(PIECE_SECONDS * RATE * 2),
  );
  const fd = openSync(file, 'w');
  try {
    writeSync(fd, wavHeader('pcm16', RATE, SECONDS * RATE));
    for (let p = 0; p < PIECES; p++) writeSync(fd, piece);
  } finally {
    closeSync(fd);
  }
}

/** Seconds of audio per second of the bare read-and-decode loop. */
function decodeLoop(file: string): number {
  const bytes = new Uint8Array(1 << 20);
  const out = new Float64Array(bytes.length / 2);
  const layout = { encoding: 'pcm' as const, bitsPerSample: 16, channels: 1 };
  let sink = 0;
  const t0 = performance.now();
  const fd = openSync(file, 'r');
  try {
    let at = HEADER;
    for (;;) {
      const got = readSync(fd, bytes, 0, bytes.length, at);
      if (got === 0) break;
      at += got;
      decodeChannel(bytes, 0, got >> 1, layout, 0, out, 0);
      sink += out[0];
    }
  } finally {
    closeSync(fd);
  }
  const s = (performance.now() - t0) / 1000;
  if (Number.isNaN(sink)) console.error('bench: decode sink is NaN');
  return SECONDS / s;
}

/** Seconds of audio per second of a whole `quantiscope analyze` run. */
function analyzeRun(script: string, files: string[], jobs: number): number {
  const t0 = performance.now();
  execFileSync(
    process.execPath,
    [script, 'analyze', ...files, '-c', 'g711-mu', '-c', 'g711-a', '--jobs', String(jobs)],
    {
      stdio: ['ignore', 'ignore', 'inherit'],
    },
  );
  return (SECONDS * files.length) / ((performance.now() - t0) / 1000);
}

function measureAll(): Measured {
  if (measured !== null) return measured;
  const script = cliScript();
  const dir = mkdtempSync(path.join(tmpdir(), 'qs-bench-cli-'));
  try {
    const file = path.join(dir, 'hour.wav');
    writeHour(file);
    // The first pass also brings the file into the page cache, as for every later one.
    decodeLoop(file);
    const decode = Math.max(decodeLoop(file), decodeLoop(file));
    const one = analyzeRun(script, [file], 1);
    const two = analyzeRun(script, [file, file], 2);
    measured = { decode, one, two };
    return measured;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const DECODE_REF = 'bare read + decode loop, same file';

registerFigure({
  name: 'analyze 1 h 48 kHz WAV, g711-mu + g711-a, one core (target >= 500x real time)',
  unit: 'x real time',
  measure() {
    const m = measureAll();
    return { value: m.one, reference: { name: DECODE_REF, value: m.decode, unit: 'x real time' } };
  },
});

registerFigure({
  name: 'analyze 2 x 1 h 48 kHz WAV, g711-mu + g711-a, two workers',
  unit: 'x real time',
  measure() {
    const m = measureAll();
    return { value: m.two, reference: { name: DECODE_REF, value: m.decode, unit: 'x real time' } };
  },
});

registerFigure({
  name: 'analyze speed-up, two workers over one core',
  unit: 'x real time',
  measure() {
    const m = measureAll();
    return { value: m.two, reference: { name: 'analyze, one core', value: m.one, unit: 'x real time' } };
  },
});
