// The talker's active frames from the current source, for the Trade-off and for designing
// a quantizer: a talker source only (the demo talker, a microphone, a file; never a test
// tone, noise or sweep), restarted with the source, and a looping file counted once, so
// the frames are exactly those the command line finds in the same file.
import type { AnalysisSnapshot } from '../../../core/analysis/analyzer';
import { FrameLevelTally } from '../../../core/design/frame-tally';
import type { FrameLevels } from '../../../core/design/index';
import type { SegmentalSnapshot } from '../../../core/measure/segmental';
import type { AudioEngine, EngineState } from '../../audio/engine';
import type { SourceKind } from '../../audio/sources';

/** Sources whose frames are a talker's. */
const TALKER_SOURCES: ReadonlySet<SourceKind> = new Set(['demo', 'microphone', 'file']);

export interface TallyStatus {
  frames: number;
  kind: SourceKind;
  label: string;
  /** The source is not a talker (tone, noise, sweep): nothing is counted. */
  excluded: boolean;
  /** A looping source's first pass is all counted (null for a microphone). */
  complete: boolean | null;
  /** Why counting stopped before the end of a pass, if it did. */
  stopped: string | null;
}

export class TalkerTally {
  private readonly tally = new FrameLevelTally();
  private readonly listeners = new Set<() => void>();
  private key = '';
  private kind: SourceKind = 'demo';
  private label = '';
  private lengthFrames: number | null = null;
  private lastTrace = -1;
  private stopped: string | null = null;
  private complete = false;
  /** A looping source's figures have restarted at its first sample (until then snapshots are of what came before). */
  private started = true;

  constructor(private readonly engine: AudioEngine) {
    engine.onChange((s) => this.follow(s));
    this.follow(engine.state());
    engine.subscribe((e) => this.take(e.analysis));
  }

  get frames(): number {
    return this.tally.frames;
  }

  levels(): FrameLevels | null {
    return this.tally.levels();
  }

  status(): TallyStatus {
    return {
      frames: this.tally.frames,
      kind: this.kind,
      label: this.label,
      excluded: !TALKER_SOURCES.has(this.kind),
      complete: this.lengthFrames === null ? null : this.complete,
      stopped: this.stopped,
    };
  }

  /** Forgets every frame; a looping source is played again from its start, so it can be counted whole. */
  reset(): void {
    this.clear();
    if (this.lengthFrames !== null) void this.engine.rewind();
    this.notify();
  }

  onChange(listener: () => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  private clear(): void {
    this.tally.reset();
    this.lastTrace = -1;
    this.stopped = null;
    this.complete = false;
  }

  private follow(s: EngineState): void {
    const src = s.source;
    this.started = src.lengthFrames === null || src.aligned !== null;
    const key = `${src.kind}|${src.label}|${src.deviceId ?? ''}|${src.lengthFrames ?? ''}`;
    if (key === this.key) return;
    this.key = key;
    this.kind = src.kind;
    this.label = src.label;
    this.lengthFrames = src.lengthFrames;
    this.clear();
    this.notify();
  }

  private take(a: AnalysisSnapshot): void {
    if (!TALKER_SOURCES.has(this.kind) || !this.started || this.stopped !== null || this.complete) return;
    const ch = a.channels[0].meter;
    const seg = ch.segmental;
    if (seg.traceLastFrame < this.lastTrace && this.lengthFrames !== null) {
      // New figures mid-pass (channel A changed): the frame count no longer follows the file.
      this.stopped = 'channel A changed during the pass; press Reset to count the file again';
      this.notify();
      return;
    }
    this.lastTrace = seg.traceLastFrame;
    const before = this.tally.frames;
    if (this.lengthFrames === null) this.tally.add(seg, ch.overloadPoint);
    else {
      // Frames of one pass: whole 20 ms frames of the buffer (the rest belongs to the loop's restart).
      const perFrame = Math.round(a.inputRate * seg.frameSeconds);
      const pass = Math.floor(this.lengthFrames / perFrame);
      this.tally.add(upTo(seg, pass - 1), ch.overloadPoint);
      if (seg.traceLastFrame >= pass - 1) this.complete = true;
    }
    if (this.tally.frames !== before || this.complete) this.notify();
  }

  private notify(): void {
    for (const l of this.listeners) l();
  }
}

/** The trace as if it ended at frame `last` (frames after it are left out). */
function upTo(s: SegmentalSnapshot, last: number): SegmentalSnapshot {
  if (s.traceLastFrame <= last) return s;
  const drop = s.traceLastFrame - last;
  return { ...s, traceLength: Math.max(0, s.traceLength - drop), traceLastFrame: last };
}
