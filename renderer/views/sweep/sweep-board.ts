// The last sweep of A and B, where the Sweep view leaves it and the Level/SNR curve
// reads it: one holder, no page events.
import type { SweepResult } from '../../../core/sweep/sweep';

export class SweepBoard {
  private last: readonly SweepResult[] | null = null;
  private readonly listeners = new Set<() => void>();

  get results(): readonly SweepResult[] | null {
    return this.last;
  }

  put(results: readonly SweepResult[] | null): void {
    this.last = results;
    for (const l of this.listeners) l();
  }

  onChange(listener: () => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }
}
