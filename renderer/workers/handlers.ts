// What the compute worker does, on core alone: the same function runs in the worker
// and, when no worker can be started, in the page.
import { DEFAULT_CANDIDATES, designForTalker, recommend } from '../../core/design/index';
import { formatStage, parseChannel } from '../../core/spec/index';
import { createQuantizer } from '../../core/quantizers/index';
import { runSweep } from '../../core/sweep/index';
import { quantizerSnrCurve } from '../../core/theory/index';
import { dbovFromDbm0 } from '../../core/units/levels';
import type { ComputeRequest, ComputeResults, DesignResult, RecommendResult } from './protocol';

/** The design `quantiscope design --bits` makes for the same frames: one function in core. */
function design(r: Extract<ComputeRequest, { kind: 'design' }>): DesignResult {
  const q = designForTalker(r.frames, r.bits);
  return { stage: formatStage(q.stage), predictedSnrDb: q.snrDb };
}

function recommendFor(r: Extract<ComputeRequest, { kind: 'recommend' }>): RecommendResult {
  const mu = new Set(DEFAULT_CANDIDATES.mu);
  const a = new Set(DEFAULT_CANDIDATES.a);
  const bits = new Set(DEFAULT_CANDIDATES.companderBits);
  const uniformBits = new Set(DEFAULT_CANDIDATES.uniformBits);
  const ids: (string | null)[] = r.channels.map((text) => {
    const spec = parseChannel(text);
    if (spec.stages.length !== 1) return null;
    const s = spec.stages[0];
    // Segment and level options do not change the prediction: match on the bare law.
    if (s.law === 'mu') {
      mu.add(s.mu);
      bits.add(s.bits);
      return formatStage({ law: 'mu', mu: s.mu, bits: s.bits });
    }
    if (s.law === 'a') {
      a.add(s.a);
      bits.add(s.bits);
      return formatStage({ law: 'a', a: s.a, bits: s.bits });
    }
    if (s.law === 'uniform') {
      uniformBits.add(s.bits);
      return s.form === 'tread' ? formatStage({ law: 'uniform', bits: s.bits, form: 'tread' }) : null;
    }
    if (s.law === 'g711-mu' || s.law === 'g711-a') return s.law;
    return null;
  });
  const sorted = (s: Set<number>) => [...s].sort((x, y) => x - y);
  const recommendation = recommend(r.frames, {
    targetSnrDb: r.targetSnrDb,
    share: r.share,
    candidates: {
      mu: sorted(mu),
      a: sorted(a),
      companderBits: sorted(bits),
      uniformBits: sorted(uniformBits),
    },
  });
  const highlight = ids.map((id) =>
    id === null ? -1 : recommendation.candidates.findIndex((c) => c.id === id),
  );
  return { recommendation, highlight };
}

export function handleCompute(r: ComputeRequest): ComputeResults[ComputeRequest['kind']] {
  switch (r.kind) {
    case 'sweep':
      return r.channels.map((c) =>
        runSweep(c, { method: r.method, fromDbm0: r.fromDbm0, toDbm0: r.toDbm0, stepDb: r.stepDb }),
      );
    case 'design':
      return design(r);
    case 'recommend':
      return recommendFor(r);
    case 'theory': {
      const q = createQuantizer(parseChannel(r.channel).stages[0]);
      const levels = r.levelsDbm0.map((l) => dbovFromDbm0(l, q.loadCapacityDbm0));
      return Array.from(quantizerSnrCurve(q, r.model, levels).snrDb);
    }
  }
}
