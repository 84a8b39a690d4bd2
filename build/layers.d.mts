// Types of layers.mjs for the tests that import it.
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
  /** True when the import vanishes from emitted code by its syntax alone. */
  typeOnly: boolean;
  line: number;
  /** Character offsets of the whole import. */
  start: number;
  end: number;
}

export type Layer = 'core' | 'worklet' | 'renderer' | 'main' | 'bench' | 'test' | 'build' | 'outside';

export interface LayerRule {
  /** Layers whose files may be imported for values (and types). */
  values: readonly Layer[];
  /** Layers whose files may be imported for types only. */
  types: readonly Layer[];
  /** Packages that may be imported by bare name. */
  packages: readonly string[];
  /** Whether Node builtins (and `/// <reference types="node">`) are allowed. */
  node: boolean;
}

export const ROOT: string;
export const RULES: Readonly<Record<Layer, LayerRule | null>>;
export function scanImports(text: string, fileName?: string): FoundImport[];
export function layerOf(relPath: string): Layer;
export function isChecked(layer: Layer): boolean;
export function ruleText(layer: Layer): string;
export function isNodeBuiltin(specifier: string): boolean;
export function packageName(specifier: string): string;
export function layerViolation(
  fromRel: string,
  imp: Pick<FoundImport, 'specifier' | 'kind' | 'typeOnly'>,
): string | null;
