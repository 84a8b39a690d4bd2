// The one design for a talker's active frames, shared by the page and the command line.
import { describe, expect, it } from 'vitest';
import { designForTalker } from '../../core/design/index';

describe('designForTalker', () => {
  it('for frames all at one level is the Laplacian Lloyd-Max table at that RMS', () => {
    // Paez and Glisson (1972), Laplacian, unit variance, N = 8 levels (from memory): thresholds
    // 0.533, 1.253, 2.380; outputs 0.233, 0.833, 1.673, 3.087. At -26 dBov the clip at the
    // overload point lies 20 RMS out, where a Laplacian holds e^(-20 sqrt 2) of its mass
    // (closed form; common practice, no source): nothing a 3-digit table shows.
    const sigma = Math.pow(10, -26 / 20);
    const d = designForTalker({ levelsDbov: [-26], weights: [500] }, 3);
    const t = d.stage.decisions.slice(4).map((v) => v / sigma);
    const y = d.stage.outputs.slice(4).map((v) => v / sigma);
    [0.533, 1.253, 2.38].forEach((v, i) => expect(t[i]).toBeCloseTo(v, 2));
    [0.233, 0.833, 1.673, 3.087].forEach((v, i) => expect(y[i]).toBeCloseTo(v, 2));
    // 12.64 dB for 3 bits (Jayant and Noll 1984, Laplacian Lloyd-Max, from memory).
    expect(d.snrDb).toBeCloseTo(12.64, 1);
    expect(d.stage.name).toBe('talker-lm-3');
  });

  it('names its tables by method unless given a name, and refuses an empty record', () => {
    const frames = { levelsDbov: [-30, -20], weights: [3, 1], overloadPoint: 0.5 };
    expect(designForTalker(frames, 4, { method: 'panter-dite' }).stage.name).toBe('talker-pd-4');
    expect(designForTalker(frames, 4, { name: 'desk-4' }).stage.name).toBe('desk-4');
    // Levels are relative to the overload point given, and frames clip there: no output beyond it.
    const d = designForTalker(frames, 4);
    expect(Math.max(...d.stage.outputs)).toBeLessThanOrEqual(0.5);
    expect(() => designForTalker({ levelsDbov: [] }, 4)).toThrow(RangeError);
  });
});
