// The layer rules in one place: the import scanner, the table of which layer may import
// which, and the verdict on one import. test/house/layers.test.ts runs them over the tree;
// build/eslint-layers.mjs runs the same functions inside ESLint, so an editor shows a bad
// import where it is written. Types: layers.d.mts beside this file.
import { builtinModules } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';

/** The repository root, for turning a linted file's path into a repository-relative one. */
export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/**
 * Every module reference in a TypeScript/JavaScript source, found with the TypeScript parser.
 * `typeOnly` reads the syntax alone: `import type`, `import { type A, type B }` (every
 * specifier marked), `export type ... from`, `import('x').T` type nodes and triple-slash
 * references vanish from the emitted code; anything else is a value import, including
 * `import { A }` used only as a type (verbatimModuleSyntax is off, so the syntax is all the
 * rule can hold the writer to) and side-effect imports `import 'x'`.
 * `start`/`end` are character offsets of the whole import, for reporting.
 */
export function scanImports(text, fileName = 'sample.ts') {
  const sf = ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, true);
  const found = [];
  const lineOf = (pos) => sf.getLineAndCharacterOfPosition(pos).line + 1;
  const add = (node, specifier, kind, typeOnly) => {
    const start = node.getStart(sf);
    found.push({ specifier, kind, typeOnly, line: lineOf(start), start, end: node.getEnd() });
  };
  const directive = (r, kind) =>
    found.push({
      specifier: r.fileName,
      kind,
      typeOnly: true,
      line: lineOf(r.pos),
      start: r.pos,
      end: r.end,
    });

  for (const r of sf.typeReferenceDirectives) directive(r, 'reference-types');
  for (const r of sf.referencedFiles) directive(r, 'reference-path');
  for (const r of sf.libReferenceDirectives) directive(r, 'reference-lib');

  // Every named specifier marked `type`, and at least one (`import {} from 'x'` keeps the module).
  const allTypes = (elements) => elements.length > 0 && elements.every((e) => e.isTypeOnly);

  const visit = (node) => {
    if (ts.isImportDeclaration(node) && ts.isStringLiteral(node.moduleSpecifier)) {
      const clause = node.importClause;
      const typeOnly =
        clause !== undefined &&
        (clause.isTypeOnly ||
          (clause.name === undefined &&
            clause.namedBindings !== undefined &&
            ts.isNamedImports(clause.namedBindings) &&
            allTypes(clause.namedBindings.elements)));
      add(node, node.moduleSpecifier.text, 'import', typeOnly);
    } else if (
      ts.isExportDeclaration(node) &&
      node.moduleSpecifier &&
      ts.isStringLiteral(node.moduleSpecifier)
    ) {
      const clause = node.exportClause;
      const typeOnly =
        node.isTypeOnly || (clause !== undefined && ts.isNamedExports(clause) && allTypes(clause.elements));
      add(node, node.moduleSpecifier.text, 'export-from', typeOnly);
    } else if (
      ts.isImportEqualsDeclaration(node) &&
      ts.isExternalModuleReference(node.moduleReference) &&
      ts.isStringLiteral(node.moduleReference.expression)
    ) {
      add(node, node.moduleReference.expression.text, 'import-equals', node.isTypeOnly);
    } else if (ts.isCallExpression(node)) {
      const [arg] = node.arguments;
      const literal = arg && ts.isStringLiteralLike(arg) ? arg.text : null;
      if (node.expression.kind === ts.SyntaxKind.ImportKeyword) {
        // A computed specifier cannot be checked, so it is reported as such.
        add(node, literal ?? '<computed>', 'dynamic-import', false);
      } else if (ts.isIdentifier(node.expression) && node.expression.text === 'require') {
        add(node, literal ?? '<computed>', 'require', false);
      }
    } else if (ts.isImportTypeNode(node)) {
      const arg = node.argument;
      if (ts.isLiteralTypeNode(arg) && ts.isStringLiteral(arg.literal))
        add(node, arg.literal.text, 'import-type', true);
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return found;
}

/** The layer a repository-relative path (forward slashes) belongs to. */
export function layerOf(relPath) {
  const p = relPath.replace(/\\/g, '/');
  if (p.startsWith('../') || p === '..') return 'outside';
  if (p.startsWith('core/')) return 'core';
  if (p.startsWith('renderer/audio/worklet/')) return 'worklet';
  if (p.startsWith('renderer/')) return 'renderer';
  if (p.startsWith('main/')) return 'main';
  if (p.startsWith('test/bench/')) return 'bench';
  if (p.startsWith('test/')) return 'test';
  if (p.startsWith('build/')) return 'build';
  return 'outside';
}

/*
 * The rule table. Arrows point down only (DEVELOPERS.md, "Layers"):
 *
 *   layer     values from              types only from          packages    Node builtins
 *   core      core                     -                        fft.js      no
 *   worklet   core, worklet            -                        -           no
 *   renderer  core, renderer, worklet  -                        uplot       no
 *   main      core, main               -                        electron    yes
 *   bench     core, bench              renderer, worklet, main  alawmulaw   yes
 *   test, build, outside: not checked (tests and tools may import anything)
 *
 * Why types-only arrows are this short: a type costs nothing at run time, but it still ties
 * one side's source to the other's. core names no one else's types. The audio thread takes
 * its types from core and itself, like its code. main and renderer never import each other,
 * not even for types: they meet through the type-only contract core/bridge.ts. The bench
 * measures the page and the command line from outside (Chromium, child processes), so it
 * may name their types, but a value import would pull DOM or shell code into its Node bundle.
 * Packages and Node builtins are allowed or refused alike for types and values: a package's
 * types describe that package's environment.
 */
export const RULES = {
  core: { values: ['core'], types: [], packages: ['fft.js'], node: false },
  worklet: { values: ['core', 'worklet'], types: [], packages: [], node: false },
  renderer: { values: ['core', 'renderer', 'worklet'], types: [], packages: ['uplot'], node: false },
  main: { values: ['core', 'main'], types: [], packages: ['electron'], node: true },
  bench: {
    values: ['core', 'bench'],
    types: ['renderer', 'worklet', 'main'],
    packages: ['alawmulaw'],
    node: true,
  },
  test: null,
  build: null,
  outside: null,
};

/** Layers that may bring another environment's lib types with `/// <reference lib>`. */
const LIB_REFERENCES = new Set(['renderer', 'bench']);

/** True for layers whose imports the rules govern. */
export function isChecked(layer) {
  return RULES[layer] !== null;
}

/** The rule of one layer in words, for messages. */
export function ruleText(layer) {
  const r = RULES[layer];
  if (!r) return `${layer} is not checked`;
  const parts = [`${layer} takes values from ${r.values.join(', ')}`];
  if (r.types.length) parts.push(`types only from ${r.types.join(', ')}`);
  parts.push(r.packages.length ? `packages ${r.packages.join(', ')}` : 'no packages');
  parts.push(r.node ? 'Node builtins' : 'no Node builtins');
  return parts.join('; ');
}

const NODE_BUILTINS = new Set(builtinModules);
export function isNodeBuiltin(specifier) {
  return specifier.startsWith('node:') || NODE_BUILTINS.has(specifier.split('/')[0]);
}

/** A package's name from a bare specifier: 'uplot/dist/x' -> 'uplot', '@a/b/c' -> '@a/b'. */
export function packageName(specifier) {
  const parts = specifier.split('/');
  return specifier.startsWith('@') ? parts.slice(0, 2).join('/') : parts[0];
}

/**
 * Why importing `imp` (as scanImports finds it) from the file at `fromRel` breaks the layer
 * rules, or null when it is allowed. Paths are repository-relative with forward slashes. The
 * message names both layers and ends with the importing layer's rule.
 */
export function layerViolation(fromRel, imp) {
  const from = layerOf(fromRel);
  const rule = RULES[from];
  if (!rule) return null;
  const spec = imp.specifier;
  const because = ` [layer rule: ${ruleText(from)}]`;
  if (spec === '<computed>') return `${from}: ${imp.kind} with a computed specifier cannot be checked`;
  if (imp.kind === 'reference-lib') {
    return LIB_REFERENCES.has(from)
      ? null
      : `${from}: /// <reference lib="${spec}"> brings another environment's types into ${from}`;
  }
  if (imp.kind === 'reference-types') {
    if (spec === 'node' && rule.node) return null;
    return `${from}: /// <reference types="${spec}"> is not allowed in ${from}${because}`;
  }
  if (spec.startsWith('.') || imp.kind === 'reference-path') {
    const target = path.posix.normalize(path.posix.join(path.posix.dirname(fromRel), spec));
    const to = layerOf(target);
    if (rule.values.includes(to)) return null;
    if (rule.types.includes(to)) {
      return imp.typeOnly
        ? null
        : `${from} may take only types from ${to}, and this ${imp.kind} brings values (${spec}): write it as a type-only import${because}`;
    }
    return `${from} may not import ${to} (${spec})${because}`;
  }
  if (spec.startsWith('/') || /^[a-z]+:\/\//i.test(spec)) return `${from}: absolute specifier ${spec}`;
  if (isNodeBuiltin(spec)) {
    return rule.node ? null : `${from} may not use the Node builtin ${spec}${because}`;
  }
  if (rule.packages.includes(packageName(spec))) return null;
  return `${from} may not import the package ${spec}${because}`;
}
