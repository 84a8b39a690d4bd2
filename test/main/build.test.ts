// The build's outputs, built into a temporary directory: every bundle there, each with
// only the imports its runtime can satisfy (sandboxed preloads may require only
// 'electron', per Electron's sandbox documentation, from memory; AudioWorklet modules
// cannot import at all here because they are loaded alone by addModule).
import { execFileSync } from 'node:child_process';
import { mkdtemp, readFile, rm, stat } from 'node:fs/promises';
import { builtinModules } from 'node:module';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildAll } from '../../build/build.mjs';
import { scanImports } from '../../build/layers.mjs';

let out: string;
const read = (rel: string) => readFile(path.join(out, rel), 'utf8');
const specifiers = async (rel: string) => scanImports(await read(rel), rel).map((i) => i.specifier);
const builtins = new Set(builtinModules.flatMap((m) => [m, `node:${m}`]));

beforeAll(async () => {
  out = await mkdtemp(path.join(tmpdir(), 'qs-build-'));
  await buildAll({ outDir: out });
});

afterAll(async () => {
  await rm(out, { recursive: true, force: true });
});

describe('build', () => {
  it('writes every bundle and the static files', async () => {
    for (const rel of [
      'main/main.cjs',
      'main/preload.cjs',
      'main/launch.cjs',
      'cli/quantiscope.cjs',
      'renderer/app.js',
      'renderer/worklet.js',
      'renderer/index.html',
      'renderer/styles.css',
    ]) {
      expect((await stat(path.join(out, rel))).isFile(), rel).toBe(true);
    }
  });

  it('leaves no imports in the worklet and the page bundle', async () => {
    expect(await specifiers('renderer/worklet.js')).toEqual([]);
    expect(await specifiers('renderer/app.js')).toEqual([]);
  });

  it('the preload requires only electron; main and launcher only electron and Node builtins', async () => {
    expect(await specifiers('main/preload.cjs')).toEqual(['electron']);
    for (const rel of ['main/main.cjs', 'main/launch.cjs']) {
      const outside = (await specifiers(rel)).filter((s) => s !== 'electron' && !builtins.has(s));
      expect(outside, rel).toEqual([]);
    }
  });

  it('the command line is an executable node script that runs alone', async () => {
    const cli = path.join(out, 'cli/quantiscope.cjs');
    expect((await read('cli/quantiscope.cjs')).startsWith('#!/usr/bin/env node\n')).toBe(true);
    expect((await stat(cli)).mode & 0o111).not.toBe(0);
    const printed = execFileSync(cli, ['channel', 'g711-a'], { encoding: 'utf8' });
    // G.711: 8 bits x 8000 samples/s.
    expect(printed).toMatch(/bit rate\s+64 kbit\/s/);
    const version = JSON.parse(await readFile(path.resolve('package.json'), 'utf8')).version as string;
    expect(execFileSync(cli, ['--version'], { encoding: 'utf8' }).trim()).toBe(version);
  });
});
