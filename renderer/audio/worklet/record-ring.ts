// What the worklet actually received (and what A and B gave for it), kept for tests
// in rings allocated up front. Reading copies, outside process().

export class RecordRing {
  readonly input: Float32Array;
  readonly outA: Float32Array;
  readonly outB: Float32Array;
  /** Samples written since the last reset. */
  written = 0;

  constructor(readonly capacity: number) {
    this.input = new Float32Array(capacity);
    this.outA = new Float32Array(capacity);
    this.outB = new Float32Array(capacity);
  }

  write(input: ArrayLike<number>, a: ArrayLike<number>, b: ArrayLike<number>, n: number): void {
    const cap = this.capacity;
    if (cap === 0) return;
    let at = this.written % cap;
    for (let i = 0; i < n; i++) {
      this.input[at] = input[i];
      this.outA[at] = a[i];
      this.outB[at] = b[i];
      if (++at === cap) at = 0;
    }
    this.written += n;
  }

  /** The most recent min(written, capacity) samples of one ring, oldest first. */
  read(ring: Float32Array): Float32Array {
    const cap = this.capacity;
    const n = Math.min(this.written, cap);
    const out = new Float32Array(n);
    const start = (this.written - n) % Math.max(cap, 1);
    for (let i = 0; i < n; i++) out[i] = ring[(start + i) % cap];
    return out;
  }

  reset(): void {
    this.written = 0;
  }
}
