// Types of build.mjs for the tests that import it.
export interface BuildResult {
  /** Output files, relative to the output directory. */
  outs: string[];
  copied: number;
  ms: number;
}
export function buildAll(options?: { outDir?: string }): Promise<BuildResult>;
