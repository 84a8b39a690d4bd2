// A local ESLint plugin with one rule, layers/arrows: the layer rules of build/layers.mjs
// (the same scanner, table and verdict the layer test runs), reported at the import.
import path from 'node:path';
import { ROOT, isChecked, layerOf, layerViolation, scanImports } from './layers.mjs';

const arrows = {
  meta: {
    type: 'problem',
    docs: { description: 'Imports follow the layer rules (build/layers.mjs): arrows point down only.' },
    schema: [],
  },
  create(context) {
    const rel = path.relative(ROOT, context.filename).split(path.sep).join('/');
    if (!isChecked(layerOf(rel))) return {};
    return {
      Program() {
        const source = context.sourceCode;
        for (const imp of scanImports(source.text, context.filename)) {
          const message = layerViolation(rel, imp);
          if (message === null) continue;
          context.report({
            loc: { start: source.getLocFromIndex(imp.start), end: source.getLocFromIndex(imp.end) },
            message,
          });
        }
      },
    };
  },
};

export default { meta: { name: 'quantiscope-layers' }, rules: { arrows } };
