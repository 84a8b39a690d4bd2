// One object for the talker statistics: level spread, sample meters and the P.56
// active level, measured on the quantizer's input at the channel rate after input
// gain. The raw-input peak and clip meter is a SignalMeter of its own at the input
// rate (see meters.ts).
import { ActiveLevelMeter } from './active-level';
import { LevelHistogram } from './levels';
import { SignalMeter } from './meters';
import { emptyTalkerSnapshot, type TalkerSnapshot } from './snapshot';

export interface TalkerMeterOptions {
  rate: number;
  /** Level reference of the channel the talker feeds; default 1. */
  overloadPoint?: number;
  /** For dBm0 in views; default +3.14 (the project's default for quantizers without a law of their own). */
  loadCapacityDbm0?: number;
  /** P.56 sliding window (10 s) and its granularity (0.1 s). */
  windowSeconds?: number;
  windowIntervalSeconds?: number;
  /** Clip detection and momentary interval, as for SignalMeter. */
  clipLevel?: number;
  minClipRun?: number;
  meterIntervalSeconds?: number;
}

export class TalkerMeter {
  readonly rate: number;
  readonly overloadPoint: number;
  readonly loadCapacityDbm0: number;
  readonly windowSeconds: number;
  readonly levels: LevelHistogram;
  readonly meter: SignalMeter;
  readonly active: ActiveLevelMeter;

  constructor(opts: TalkerMeterOptions) {
    this.rate = opts.rate;
    this.overloadPoint = opts.overloadPoint ?? 1;
    this.loadCapacityDbm0 = opts.loadCapacityDbm0 ?? 3.14;
    this.windowSeconds = opts.windowSeconds ?? 10;
    this.levels = new LevelHistogram(this.overloadPoint);
    this.meter = new SignalMeter({
      rate: opts.rate,
      overloadPoint: this.overloadPoint,
      clipLevel: opts.clipLevel,
      minClipRun: opts.minClipRun,
      intervalSeconds: opts.meterIntervalSeconds,
    });
    this.active = new ActiveLevelMeter({
      rate: opts.rate,
      overloadPoint: this.overloadPoint,
      windowSeconds: this.windowSeconds,
      intervalSeconds: opts.windowIntervalSeconds,
    });
  }

  reset(): void {
    this.levels.reset();
    this.meter.reset();
    this.active.reset();
  }

  /** Adds samples [start, end) of a block of the quantizer's input. */
  add(x: ArrayLike<number>, start = 0, end = x.length): void {
    this.levels.add(x, start, end);
    this.meter.add(x, start, end);
    this.active.add(x, start, end);
  }

  createSnapshot(): TalkerSnapshot {
    return emptyTalkerSnapshot();
  }

  snapshot(into: TalkerSnapshot = this.createSnapshot()): TalkerSnapshot {
    into.rate = this.rate;
    into.overloadPoint = this.overloadPoint;
    into.loadCapacityDbm0 = this.loadCapacityDbm0;
    into.windowSeconds = this.windowSeconds;
    this.meter.snapshot(into.meter);
    const l = into.levels;
    l.counts.set(this.levels.counts);
    l.underflow = this.levels.underflow;
    l.overload = this.levels.overload;
    l.total = this.levels.total;
    this.active.longTerm(into.activeLongTerm);
    this.active.window(into.activeWindow);
    return into;
  }
}
