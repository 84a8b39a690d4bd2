// One build for every target: main, preload, renderer, worklet, command line, bench.
// Usage: node build/build.mjs [--quiet]
import { build } from 'esbuild';
import { chmod, copyFile, mkdir, readdir, readFile, rm } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const dist = path.join(root, 'dist');
const quiet = process.argv.includes('--quiet');

const pkg = JSON.parse(await readFile(path.join(root, 'package.json'), 'utf8'));

const common = {
  bundle: true,
  sourcemap: 'linked',
  target: 'es2022',
  logLevel: 'warning',
  legalComments: 'none',
  define: { __QUANTISCOPE_VERSION__: JSON.stringify(pkg.version) },
};

/** Every bundle (`out` relative to the output directory); `optional` entries are skipped while their source does not exist yet. */
const targets = [
  {
    entry: 'main/main.ts',
    out: 'main/main.cjs',
    platform: 'node',
    format: 'cjs',
    external: ['electron'],
  },
  // Sandboxed preloads may require only 'electron'; everything else is bundled in.
  {
    entry: 'main/preload.ts',
    out: 'main/preload.cjs',
    platform: 'node',
    format: 'cjs',
    external: ['electron'],
  },
  // The launcher behind `npm start`: Electron when its binary exists, else the browser shell.
  // require('electron') stays external: under Node it returns the binary's path.
  {
    entry: 'main/launch.ts',
    out: 'main/launch.cjs',
    platform: 'node',
    format: 'cjs',
    external: ['electron'],
  },
  {
    entry: 'main/cli/quantiscope.ts',
    out: 'cli/quantiscope.cjs',
    platform: 'node',
    format: 'cjs',
    banner: { js: '#!/usr/bin/env node' },
    executable: true,
  },
  { entry: 'renderer/app.ts', out: 'renderer/app.js', platform: 'browser', format: 'esm' },
  // Loaded by audioWorklet.addModule: must be one file with no imports left.
  {
    entry: 'renderer/audio/worklet/processor.ts',
    out: 'renderer/worklet.js',
    platform: 'neutral',
    format: 'esm',
  },
  // The views' compute worker (sweeps, design, recommender): one classic-worker file.
  {
    entry: 'renderer/workers/compute.ts',
    out: 'renderer/compute-worker.js',
    platform: 'browser',
    format: 'iife',
  },
  {
    entry: 'test/bench/bench.ts',
    out: 'bench/bench.mjs',
    platform: 'node',
    format: 'esm',
    optional: true,
    // Reference libraries are measured as installed, not bundled.
    packages: 'external',
  },
];

/** The page, its style sheets and its icon (favicon.svg), copied beside the bundles. */
async function copyStatic(outDir) {
  const out = path.join(outDir, 'renderer');
  await mkdir(out, { recursive: true });
  const names = (await readdir(path.join(root, 'renderer'))).filter(
    (n) => n === 'index.html' || n.endsWith('.css') || n.endsWith('.svg'),
  );
  await Promise.all(names.map((n) => copyFile(path.join(root, 'renderer', n), path.join(out, n))));
  return names.length;
}

/** Builds everything into `outDir` (default dist/), emptied first. */
export async function buildAll({ outDir = dist } = {}) {
  const started = performance.now();
  await rm(outDir, { recursive: true, force: true });
  const jobs = targets
    .filter((t) => !t.optional || existsSync(path.join(root, t.entry)))
    .map(async (t) => {
      await build({
        ...common,
        entryPoints: [path.join(root, t.entry)],
        outfile: path.join(outDir, t.out),
        platform: t.platform,
        format: t.format,
        external: t.external,
        banner: t.banner,
        packages: t.packages,
        mainFields: t.platform === 'neutral' ? ['module', 'main'] : undefined,
      });
      if (t.executable) await chmod(path.join(outDir, t.out), 0o755);
      return t.out;
    });
  const outs = await Promise.all(jobs);
  const copied = await copyStatic(outDir);
  return { outs, copied, ms: Math.round(performance.now() - started) };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  try {
    const { outs, copied, ms } = await buildAll();
    if (!quiet) console.log(`build: ${outs.length} bundles + ${copied} static files in dist/ (${ms} ms)`);
  } catch (err) {
    // esbuild already printed the located errors.
    if (!quiet) console.error(`build failed: ${err instanceof Error ? err.message.split('\n')[0] : err}`);
    process.exitCode = 1;
  }
}
