// Import scanning and the layer rules, kept apart from the test so the test can check
// the scanner and the rules themselves on sample text.
import { builtinModules } from 'node:module';
import path from 'node:path';
import ts from 'typescript';

export type ImportKind =
  | 'import'
  | 'export-from'
  | 'import-equals'
  | 'dynamic-import'
  | 'require'
  | 'import-type'
  | 'reference-types'
  | 'reference-path'
  | 'reference-lib';

export interface FoundImport {
  specifier: string;
  kind: ImportKind;
  line: number;
}

/** Every module reference in a TypeScript/JavaScript source, found with the TypeScript parser. */
export function scanImports(text: string, fileName = 'sample.ts'): FoundImport[] {
  const sf = ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, true);
  const found: FoundImport[] = [];
  const lineOf = (pos: number) => sf.getLineAndCharacterOfPosition(pos).line + 1;
  const add = (node: ts.Node, specifier: string, kind: ImportKind) =>
    found.push({ specifier, kind, line: lineOf(node.getStart(sf)) });

  for (const r of sf.typeReferenceDirectives)
    found.push({ specifier: r.fileName, kind: 'reference-types', line: lineOf(r.pos) });
  for (const r of sf.referencedFiles)
    found.push({ specifier: r.fileName, kind: 'reference-path', line: lineOf(r.pos) });
  for (const r of sf.libReferenceDirectives)
    found.push({ specifier: r.fileName, kind: 'reference-lib', line: lineOf(r.pos) });

  const visit = (node: ts.Node): void => {
    if (ts.isImportDeclaration(node) && ts.isStringLiteral(node.moduleSpecifier)) {
      add(node, node.moduleSpecifier.text, 'import');
    } else if (
      ts.isExportDeclaration(node) &&
      node.moduleSpecifier &&
      ts.isStringLiteral(node.moduleSpecifier)
    ) {
      add(node, node.moduleSpecifier.text, 'export-from');
    } else if (
      ts.isImportEqualsDeclaration(node) &&
      ts.isExternalModuleReference(node.moduleReference) &&
      ts.isStringLiteral(node.moduleReference.expression)
    ) {
      add(node, node.moduleReference.expression.text, 'import-equals');
    } else if (ts.isCallExpression(node)) {
      const [arg] = node.arguments;
      const literal = arg && ts.isStringLiteralLike(arg) ? arg.text : null;
      if (node.expression.kind === ts.SyntaxKind.ImportKeyword) {
        // A computed specifier cannot be checked, so it is reported as such.
        add(node, literal ?? '<computed>', 'dynamic-import');
      } else if (ts.isIdentifier(node.expression) && node.expression.text === 'require') {
        add(node, literal ?? '<computed>', 'require');
      }
    } else if (ts.isImportTypeNode(node)) {
      const arg = node.argument;
      if (ts.isLiteralTypeNode(arg) && ts.isStringLiteral(arg.literal))
        add(node, arg.literal.text, 'import-type');
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return found;
}

export type Layer = 'core' | 'worklet' | 'renderer' | 'main' | 'bench' | 'test' | 'build' | 'outside';

/** The layer a repository-relative path (forward slashes) belongs to. */
export function layerOf(relPath: string): Layer {
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

const NODE_BUILTINS = new Set(builtinModules);
export function isNodeBuiltin(specifier: string): boolean {
  return specifier.startsWith('node:') || NODE_BUILTINS.has(specifier.split('/')[0]);
}

/** Packages each layer may use by bare name (besides Node builtins where allowed). */
const PACKAGES: Record<Layer, readonly string[]> = {
  // fft.js is plain JavaScript with no DOM or Node use, so core stays runnable everywhere.
  core: ['fft.js'],
  worklet: [],
  renderer: ['uplot'],
  main: ['electron'],
  // The bench measures core against the reference library in Node.
  bench: ['alawmulaw'],
  test: [],
  build: [],
  outside: [],
};

/** Layers whose files each layer may import by relative path. */
const REACHABLE: Record<Layer, readonly Layer[]> = {
  core: ['core'],
  worklet: ['core', 'worklet'],
  renderer: ['core', 'renderer', 'worklet'],
  main: ['core', 'main'],
  bench: ['core', 'bench'],
  test: [],
  build: [],
  outside: [],
};

const NODE_ALLOWED: ReadonlySet<Layer> = new Set<Layer>(['main', 'bench']);

/** A package's name from a bare specifier: 'uplot/dist/x' -> 'uplot', '@a/b/c' -> '@a/b'. */
export function packageName(specifier: string): string {
  const parts = specifier.split('/');
  return specifier.startsWith('@') ? parts.slice(0, 2).join('/') : parts[0];
}

/**
 * Why importing `imp` from the file at `fromRel` breaks the layer rules, or null when
 * it is allowed. Paths are repository-relative with forward slashes.
 */
export function layerViolation(fromRel: string, imp: FoundImport): string | null {
  const from = layerOf(fromRel);
  const spec = imp.specifier;
  const where = `${fromRel}:${imp.line}`;
  if (spec === '<computed>') return `${where}: ${imp.kind} with a computed specifier cannot be checked`;
  if (imp.kind === 'reference-lib') {
    return from === 'core' || from === 'worklet' || from === 'main'
      ? `${where}: /// <reference lib="${spec}"> brings another environment's types into ${from}`
      : null;
  }
  if (imp.kind === 'reference-types') {
    if (spec === 'node' && NODE_ALLOWED.has(from)) return null;
    return `${where}: /// <reference types="${spec}"> is not allowed in ${from}`;
  }
  if (spec.startsWith('.') || imp.kind === 'reference-path') {
    const target = path.posix.normalize(path.posix.join(path.posix.dirname(fromRel), spec));
    const to = layerOf(target);
    if (REACHABLE[from].includes(to)) return null;
    return `${where}: ${from} may not import ${to} (${spec})`;
  }
  if (spec.startsWith('/') || /^[a-z]+:\/\//i.test(spec)) return `${where}: absolute specifier ${spec}`;
  if (isNodeBuiltin(spec)) {
    return NODE_ALLOWED.has(from) ? null : `${where}: ${from} may not use the Node builtin ${spec}`;
  }
  if (PACKAGES[from].includes(packageName(spec))) return null;
  return `${where}: ${from} may not import the package ${spec}`;
}
