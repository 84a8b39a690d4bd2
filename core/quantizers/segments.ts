// Segment bands shared by the quantizers that have no chords of their own.
// 6 dB bands counted down from the overload point line up with the G.711 chords,
// so segment ledgers of different channels can be read side by side.

/** S+1 ascending magnitudes: 0, V*2^-(S-1), ..., V/2, V. */
export function sixDbBandEdges(overloadPoint: number, count: number): Float64Array {
  const edges = new Float64Array(count + 1);
  for (let s = 1; s <= count; s++) edges[s] = overloadPoint * Math.pow(2, s - count);
  return edges;
}

/** Band of a magnitude (edges from sixDbBandEdges or any ascending edges starting at 0). */
export function bandOf(magnitude: number, edges: Float64Array): number {
  let s = edges.length - 2;
  while (s > 0 && magnitude < edges[s]) s--;
  return s;
}

/** Segment edges in dBov (edges[0] = 0 becomes -Infinity; plots start at the next edge). */
export function edgesToDbov(edges: Float64Array, overloadPoint: number): Float64Array {
  const out = new Float64Array(edges.length);
  for (let i = 0; i < edges.length; i++) out[i] = 20 * Math.log10(edges[i] / overloadPoint);
  return out;
}

export function checkSegmentCount(count: number): void {
  if (!Number.isInteger(count) || count < 1 || count > 64) {
    throw new RangeError(`segment count must be a whole number from 1 to 64 (got ${count})`);
  }
}
