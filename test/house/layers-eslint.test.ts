// The layer rule inside ESLint (layers/arrows, build/eslint-layers.mjs), run through ESLint's
// own API with the repository's config, so what an editor shows is what the layer test holds.
// Source of the rules: our own requirement (DEVELOPERS.md, "Layers").
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../..', import.meta.url));
const eslint = new ESLint({ cwd: root, overrideConfigFile: 'build/eslint.config.mjs' });

async function layerMessages(rel: string, text: string) {
  const [result] = await eslint.lintText(text, { filePath: path.join(root, rel) });
  return result.messages.filter((m) => m.ruleId === 'layers/arrows');
}

describe('ESLint rule layers/arrows', () => {
  it('reports a value import of main in core at the import, naming both layers and the rule', async () => {
    const text = "export const x = 1;\nimport { m } from '../../main/m';\nexport { m };\n";
    const messages = await layerMessages('core/a/x.ts', text);
    expect(messages).toHaveLength(1);
    expect(messages[0].message).toContain('core may not import main (../../main/m)');
    expect(messages[0].message).toContain('[layer rule: core takes values from core');
    expect(messages[0]).toMatchObject({ line: 2, column: 1, severity: 2 });
  });

  it('reports a value import across a types-only arrow, and not the same import written as a type', async () => {
    const value = await layerMessages(
      'test/bench/x.ts',
      "import { AudioEngine } from '../../renderer/audio/engine';\nexport const e = AudioEngine;\n",
    );
    expect(value.map((m) => m.message)).toEqual([
      expect.stringContaining('bench may take only types from renderer'),
    ]);
    const typed = await layerMessages(
      'test/bench/x.ts',
      "import type { EngineState } from '../../renderer/audio/engine';\nexport type S = EngineState;\n",
    );
    expect(typed).toEqual([]);
  });

  it('says nothing about a good import in core', async () => {
    const [result] = await eslint.lintText("import { y } from '../b/y';\nexport const x = y;\n", {
      filePath: path.join(root, 'core/a/x.ts'),
    });
    expect(result.messages).toEqual([]);
  });
});
