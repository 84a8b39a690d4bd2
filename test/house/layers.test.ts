// The house rules of DEVELOPERS.md "Layers": arrows point down only. The scanner, the rule
// table and the verdict live in build/layers.mjs, which the ESLint rule layers/arrows runs too.
// Source of the rules: our own requirement (DEVELOPERS.md, "Layers"). Type-only means the
// syntax TypeScript always erases: `import type` and `type` on every named specifier
// (TypeScript 3.8 and 4.5 release notes, from memory).
import { readdirSync, readFileSync, existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';
import { layerOf, layerViolation, RULES, scanImports, type FoundImport } from '../../build/layers.mjs';

const root = fileURLToPath(new URL('../..', import.meta.url));
const SOURCE = /\.(ts|tsx|mts|cts|js|mjs|cjs)$/;

function listSources(dir: string): string[] {
  const abs = path.join(root, dir);
  if (!existsSync(abs)) return [];
  const out: string[] = [];
  for (const entry of readdirSync(abs, { withFileTypes: true })) {
    const rel = `${dir}/${entry.name}`;
    if (entry.isDirectory()) out.push(...listSources(rel));
    else if (SOURCE.test(entry.name)) out.push(rel);
  }
  return out;
}

const violationsIn = (rel: string, text: string) =>
  scanImports(text, rel).flatMap((imp) => {
    const why = layerViolation(rel, imp);
    return why === null ? [] : [`${rel}:${imp.line}: ${why}`];
  });

describe('import scanner', () => {
  // Triple-slash directives count only before the first statement, as in the compiler.
  const sample = [
    '/// <reference types="node" />',
    '/// <reference lib="dom" />',
    "import a from './a';",
    "import type { B } from '../b';",
    "import * as c from 'c-pkg';",
    "import 'side-effect';",
    "export * from './d';",
    "export { e } from './e';",
    "import f = require('f');",
    "const g = await import('./g');",
    "const h = require('h');",
    "type I = import('./i').I;",
    '/// <reference types="late-is-a-comment" />',
    '// a comment that mentions require("not-this")',
    'const s = \'import x from "nor-this"\';',
    'const dyn = import(name);',
  ].join('\n');

  it('finds every form of import and nothing in comments or strings', () => {
    const found = scanImports(sample).map((i: FoundImport) => `${i.kind} ${i.specifier}`);
    expect(found.sort()).toEqual(
      [
        'import ./a',
        'import ../b',
        'import c-pkg',
        'import side-effect',
        'export-from ./d',
        'export-from ./e',
        'import-equals f',
        'dynamic-import ./g',
        'require h',
        'import-type ./i',
        'reference-types node',
        'reference-lib dom',
        'dynamic-import <computed>',
      ].sort(),
    );
  });

  it('reports line numbers and the offsets of the whole import', () => {
    const text = "\n\nimport x from 'y';";
    const [found] = scanImports(text);
    expect(found.line).toBe(3);
    expect(text.slice(found.start, found.end)).toBe("import x from 'y';");
  });

  it.each([
    ["import type { X } from './x';", true],
    ["import type X from './x';", true],
    ["import type * as X from './x';", true],
    ["import { type X, type Y } from './x';", true],
    ["export type { X } from './x';", true],
    ["export { type X, type Y } from './x';", true],
    ["export type * from './x';", true],
    ["import type X = require('./x');", true],
    ["type T = import('./x').T;", true],
    ["let t: typeof import('./x');", true],
    ['/// <reference types="x" />', true],
    ["import { type X, Y } from './x';", false],
    ["import X from './x';", false],
    ["import X, { type Y } from './x';", false],
    ["import * as X from './x';", false],
    ["import { X } from './x';", false],
    ["import {} from './x';", false],
    ["import './x';", false],
    ["export * from './x';", false],
    ["export * as X from './x';", false],
    ["export { X, type Y } from './x';", false],
    ["import X = require('./x');", false],
    ["const x = await import('./x');", false],
    ["const x = require('./x');", false],
  ])('%s -> type-only %s', (text, typeOnly) => {
    const found = scanImports(text);
    expect(found.map((i) => i.specifier)).toEqual([text.startsWith('///') ? 'x' : './x']);
    expect(found[0].typeOnly).toBe(typeOnly);
  });
});

describe('layer rules on sample files (the check can fail)', () => {
  const cases: [string, string, boolean][] = [
    ['core/a/x.ts', "import { y } from '../b/y';", true],
    ['core/a/x.ts', "import { r } from '../../renderer/r';", false],
    ['core/a/x.ts', "import { m } from '../../main/m';", false],
    ['core/a/x.ts', "import fs from 'node:fs';", false],
    ['core/a/x.ts', "import fs from 'fs';", false],
    ['core/a/x.ts', "import { app } from 'electron';", false],
    ['core/a/x.ts', "import uPlot from 'uplot';", false],
    ['core/a/x.ts', "import FFT from 'fft.js';", true],
    ['core/a/x.ts', '/// <reference lib="dom" />', false],
    ['core/a/x.ts', '/// <reference types="node" />', false],
    ['core/a/x.ts', "const t: import('../../main/m').T = 1;", false],
    ['core/a/x.ts', "const fs = require('fs');", false],
    ['core/a/x.ts', "const q = await import('../../test/x');", false],
    ['renderer/app.ts', "import { q } from '../core/q';", true],
    ['renderer/app.ts', "import uPlot from 'uplot';", true],
    ['renderer/app.ts', "import { PROCESSOR_NAME } from './audio/worklet/messages';", true],
    ['renderer/app.ts', "import { s } from '../main/server';", false],
    ['renderer/app.ts', "import { ipcRenderer } from 'electron';", false],
    ['renderer/app.ts', "import path from 'node:path';", false],
    ['renderer/audio/worklet/p.ts', "import { q } from '../../../core/q';", true],
    ['renderer/audio/worklet/p.ts', "import { m } from './messages';", true],
    ['renderer/audio/worklet/p.ts', "import { e } from '../engine';", false],
    ['renderer/audio/worklet/p.ts', "import uPlot from 'uplot';", false],
    ['main/main.ts', "import { app } from 'electron';", true],
    ['main/main.ts', "import { readFile } from 'node:fs/promises';", true],
    ['main/main.ts', "import http from 'http';", true],
    ['main/main.ts', "import type { AppInfo } from '../core/bridge';", true],
    ['main/main.ts', "import { h } from '../renderer/dom';", false],
    ['main/main.ts', "import uPlot from 'uplot';", false],
    ['test/bench/bench.ts', "import { alaw } from 'alawmulaw';", true],
    ['test/bench/bench.ts', "import { h } from '../../renderer/dom';", false],
    // Types-only arrows: the value import is reported, the same import written as a type is not.
    ['test/bench/bench.ts', "import type { EngineState } from '../../renderer/audio/engine';", true],
    ['test/bench/bench.ts', "import { type EngineState } from '../../renderer/audio/engine';", true],
    [
      'test/bench/bench.ts',
      "import { type EngineState, AudioEngine } from '../../renderer/audio/engine';",
      false,
    ],
    ['test/bench/bench.ts', "import { EngineState } from '../../renderer/audio/engine';", false],
    ['test/bench/bench.ts', "import '../../renderer/audio/engine';", false],
    ['test/bench/bench.ts', "export type { EngineState } from '../../renderer/audio/engine';", true],
    ['test/bench/bench.ts', "export { EngineState } from '../../renderer/audio/engine';", false],
    ['test/bench/bench.ts', "type S = import('../../renderer/audio/engine').EngineState;", true],
    ['test/bench/bench.ts', "const e = await import('../../renderer/audio/engine');", false],
    ['test/bench/bench.ts', "import type { Processor } from '../../renderer/audio/worklet/processor';", true],
    ['test/bench/bench.ts', "import { run } from '../../main/cli/run';", false],
    ['test/bench/bench.ts', "import type { CliIo } from '../../main/cli/run';", true],
    // No types-only arrow where the table has none: a type import across is still refused.
    ['core/a/x.ts', "import type { T } from '../../main/m';", false],
    ['core/a/x.ts', "import type { T } from '../../renderer/r';", false],
    ['core/a/x.ts', "import type { Buffer } from 'node:buffer';", false],
    ['renderer/audio/worklet/p.ts', "import type { EngineState } from '../engine';", false],
    ['renderer/app.ts', "import type { T } from '../main/m';", false],
    ['main/main.ts', "import type { T } from '../renderer/r';", false],
    ['main/main.ts', "import type { T } from '../test/bench/harness';", false],
    ['test/bench/bench.ts', "import type { X } from '../core/y';", false],
  ];
  it.each(cases)('%s: %s -> allowed %s', (file, text, allowed) => {
    expect(violationsIn(file, text).length === 0).toBe(allowed);
  });

  it('names both layers and the rule in its message', () => {
    const [value] = scanImports("import { h } from '../../renderer/dom';");
    const why = layerViolation('test/bench/bench.ts', value) ?? '';
    expect(why).toContain('bench may take only types from renderer');
    expect(why).toContain(`[layer rule: bench takes values from core, bench; types only from renderer`);
    const [across] = scanImports("import { m } from '../../main/m';");
    expect(layerViolation('core/a/x.ts', across)).toBe(
      'core may not import main (../../main/m) [layer rule: core takes values from core; packages fft.js; no Node builtins]',
    );
  });

  it('leaves tests and tools unchecked, and no checked layer may import them', () => {
    const [bench] = scanImports("import { h } from '../renderer/dom';");
    expect(layerViolation('test/x.test.ts', bench)).toBeNull();
    expect(layerViolation('build/x.mjs', bench)).toBeNull();
    const reached = Object.values(RULES).flatMap((rule) => (rule ? [...rule.values, ...rule.types] : []));
    expect(reached.length).toBeGreaterThan(0);
    expect(reached).not.toContain('test');
    expect(reached).not.toContain('build');
    expect(reached).not.toContain('outside');
  });

  it('classifies paths into layers', () => {
    expect(layerOf('renderer/audio/worklet/processor.ts')).toBe('worklet');
    expect(layerOf('renderer/app.ts')).toBe('renderer');
    expect(layerOf('test/bench/bench.ts')).toBe('bench');
    expect(layerOf('../elsewhere/x.ts')).toBe('outside');
  });
});

describe('layers of this repository', () => {
  const files = ['core', 'renderer', 'main', 'test/bench'].flatMap(listSources);

  it('has sources in every layer it checks', () => {
    expect(files.some((f) => f.startsWith('core/'))).toBe(true);
    expect(files.some((f) => f.startsWith('renderer/audio/worklet/'))).toBe(true);
    expect(files.some((f) => f.startsWith('renderer/'))).toBe(true);
    expect(files.some((f) => f.startsWith('main/'))).toBe(true);
  });

  it('no import points up or across', () => {
    const violations = files.flatMap((rel) => violationsIn(rel, readFileSync(path.join(root, rel), 'utf8')));
    expect(violations).toEqual([]);
  });

  it('core/bridge.ts holds types only, so neither side pulls code from the other through it', () => {
    const text = readFileSync(path.join(root, 'core/bridge.ts'), 'utf8');
    const sf = ts.createSourceFile('bridge.ts', text, ts.ScriptTarget.Latest, true);
    const runtime = sf.statements.filter(
      (s) =>
        !ts.isInterfaceDeclaration(s) &&
        !ts.isTypeAliasDeclaration(s) &&
        !(ts.isImportDeclaration(s) && s.importClause?.isTypeOnly) &&
        !(ts.isExportDeclaration(s) && s.isTypeOnly),
    );
    expect(runtime.map((s) => s.getText(sf).slice(0, 60))).toEqual([]);
  });

  it('main and renderer meet only through core/bridge.ts, imported as a type', () => {
    const bridgeUsers = files
      .filter((f) => f.startsWith('main/') || f.startsWith('renderer/'))
      .flatMap((rel) =>
        scanImports(readFileSync(path.join(root, rel), 'utf8'), rel)
          .filter((i) => i.specifier.endsWith('core/bridge'))
          .map((i) => ({ rel, kind: i.kind, typeOnly: i.typeOnly })),
      );
    expect(bridgeUsers.length).toBeGreaterThan(0);
    for (const use of bridgeUsers) expect(use, use.rel).toMatchObject({ kind: 'import', typeOnly: true });
  });
});
