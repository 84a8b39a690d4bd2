// Feedback-howl watch on the audio thread: core's detector on the raw input (before
// the input gain, as howl.ts asks), fed only while a live microphone is the source,
// read into the snapshot envelope without allocating.
import { emptyHowlState, HowlDetector, type HowlState } from '../../../core/measure/howl';
import type { HowlReadout } from './messages';

export class HowlWatch {
  private readonly detector: HowlDetector;
  private readonly current: HowlState = emptyHowlState();
  /** Whether the detector fired at any read since the last reset. */
  ever = false;

  constructor(readonly rate: number) {
    this.detector = new HowlDetector({ rate });
  }

  add(block: ArrayLike<number>, n: number): void {
    this.detector.add(block, 0, n);
  }

  /** Refreshes the readout (at snapshot time, not per block). */
  read(into: HowlReadout): void {
    this.detector.state(this.current);
    if (this.current.howling) this.ever = true;
    into.howling = this.current.howling;
    into.frequencyHz = this.current.frequencyHz;
  }

  reset(): void {
    this.detector.reset();
    this.detector.state(this.current);
    this.ever = false;
  }
}
