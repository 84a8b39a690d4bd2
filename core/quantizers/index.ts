// One entry point for every quantizer the core knows.
import { aLaw, muLaw } from '../laws/index';
import { formatStage } from '../spec/format';
import { parseStage } from '../spec/parse';
import type { StageSpec } from '../spec/types';
import { CompandedQuantizer } from './companded';
import { createG711AQuantizer, createG711MuQuantizer } from './g711';
import { edgesToDbov } from './segments';
import { TableQuantizer } from './table';
import type { Quantizer } from './types';
import { UniformQuantizer } from './uniform';

/** Build a quantizer from a stage specification (or its text form, e.g. `mu:255:8`). */
export function createQuantizer(config: StageSpec | string): Quantizer {
  const stage = typeof config === 'string' ? parseStage(config) : config;
  const label = formatStage(stage);
  switch (stage.law) {
    case 'g711-mu':
      return createG711MuQuantizer({ zeroSuppression: stage.zeroSuppression === true });
    case 'g711-a':
      return createG711AQuantizer();
    case 'uniform':
      return new UniformQuantizer(stage, label);
    case 'mu':
      return new CompandedQuantizer(muLaw(stage.mu), stage, label);
    case 'a':
      return new CompandedQuantizer(aLaw(stage.a), stage, label);
    case 'table':
      return new TableQuantizer(stage, label);
  }
}

/** Segment edges in dBov for plotting (the first edge, 0, is -Infinity). */
export function segmentEdgesDbov(q: Quantizer): Float64Array {
  return edgesToDbov(q.segmentEdges, q.overloadPoint);
}

export type { Quantizer, QuantizerTable, QuantizedSample, QuantizerKind } from './types';
