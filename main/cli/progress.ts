// A progress line on stderr for runs that take a while: nothing for the first
// second (short runs stay quiet), then at most ten updates a second, and the line
// is wiped when the run ends. The CLI hands a status sink only when stderr is a
// terminal, so pipes and log files never see it.

export type StatusSink = (line: string) => void;

export const PROGRESS_DELAY_MS = 1000;
const PROGRESS_INTERVAL_MS = 100;

export class Progress {
  private readonly started: number;
  private last = -Infinity;
  private shown = false;

  constructor(
    private readonly sink: StatusSink | undefined,
    private readonly label: string,
    private readonly now: () => number = () => performance.now(),
  ) {
    this.started = now();
  }

  /** `fraction` of the work is done (0..1); `detail` follows the percentage. */
  update(fraction: number, detail = ''): void {
    if (this.sink === undefined) return;
    const t = this.now();
    if (t - this.started < PROGRESS_DELAY_MS || t - this.last < PROGRESS_INTERVAL_MS) return;
    this.last = t;
    this.shown = true;
    const pct = Math.min(100, Math.max(0, 100 * fraction)).toFixed(0);
    this.sink(`${this.label}: ${pct.padStart(3)}%${detail === '' ? '' : ` ${detail}`}`);
  }

  /** Wipes the line if one was shown. */
  done(): void {
    if (this.shown) this.sink?.('');
    this.shown = false;
  }
}

/** Progress of several tasks at once: each reports its own done / total. */
export class TaskProgress {
  private readonly fractions: Float64Array;
  private finished = 0;

  constructor(
    private readonly progress: Progress,
    readonly count: number,
  ) {
    this.fractions = new Float64Array(count);
  }

  task(index: number, done: number, total: number): void {
    this.fractions[index] = total > 0 ? Math.min(1, done / total) : 0;
    this.report();
  }

  settled(index: number): void {
    this.fractions[index] = 1;
    this.finished++;
    this.report();
  }

  private report(): void {
    let sum = 0;
    for (let i = 0; i < this.count; i++) sum += this.fractions[i];
    this.progress.update(this.count > 0 ? sum / this.count : 1, `(${this.finished}/${this.count} files)`);
  }
}
