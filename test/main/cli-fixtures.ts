// Shared by the command-line tests: seeded WAV fixtures written by the tests
// themselves, the command line run in process with captured output, and the CLI
// bundled the way build/build.mjs bundles it (into a temporary directory, so the
// shared dist/ is never touched).
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';
import { writeWavFile } from '../../main/cli/audio-file';
import { runCli, type CliEnv } from '../../main/cli/run';
import { fillGaussian, fillLaplacian } from '../../core/signals/noise';
import { Xoshiro128 } from '../../core/signals/random';
import { fillSine } from '../../core/signals/tone';
import { ascii, fmt, le32, type FmtFields } from '../core/wav-riff';

export const ROOT = fileURLToPath(new URL('../..', import.meta.url));

export function toPcm16(x: ArrayLike<number>): Int16Array {
  const s = new Int16Array(x.length);
  for (let i = 0; i < x.length; i++) s[i] = Math.max(-32768, Math.min(32767, Math.round(x[i] * 32768)));
  return s;
}

export async function writePcm16(file: string, rate: number, x: ArrayLike<number>): Promise<void> {
  await writeWavFile(file, { encoding: 'pcm16', sampleRate: rate, samples: toPcm16(x) });
}

export function sine(rate: number, seconds: number, amplitude: number, hz = 1020): Float64Array {
  const x = new Float64Array(Math.round(rate * seconds));
  fillSine(x, amplitude, hz, rate);
  return x;
}

export function gaussian(rate: number, seconds: number, sigma: number, seed: number): Float64Array {
  const x = new Float64Array(Math.round(rate * seconds));
  fillGaussian(new Xoshiro128(seed), x, sigma);
  return x;
}

/**
 * Speech-like test signal: Laplacian bursts of 200 ms with a pause every third,
 * their RMS levels stepping through `levelsDbov` (re full scale), pauses 60 dB below the first.
 */
export function talker(
  rate: number,
  seconds: number,
  seed: number,
  levelsDbov: readonly number[],
): Float64Array {
  const x = new Float64Array(Math.round(rate * seconds));
  const rng = new Xoshiro128(seed);
  const burst = new Float64Array(Math.round(0.2 * rate));
  for (let at = 0, k = 0, spoken = 0; at < x.length; at += burst.length, k++) {
    const pause = k % 3 === 2;
    const level = pause ? levelsDbov[0] - 60 : levelsDbov[spoken++ % levelsDbov.length];
    fillLaplacian(rng, burst, Math.pow(10, level / 20));
    for (let i = 0; i < burst.length && at + i < x.length; i++) x[at + i] = burst[i];
  }
  return x;
}

/** A WAV file: RIFF/WAVE, fmt, then data holding these sample bytes (layout of test/core/wav-riff.ts, from memory). */
export function wavFile(format: FmtFields, data: Uint8Array): Uint8Array {
  const fmtChunk = fmt(format);
  const head = [
    ...ascii('RIFF'),
    ...le32(4 + fmtChunk.length + 8 + data.length),
    ...ascii('WAVE'),
    ...fmtChunk,
    ...ascii('data'),
    ...le32(data.length),
  ];
  const bytes = new Uint8Array(head.length + data.length);
  bytes.set(head);
  bytes.set(data, head.length);
  return bytes;
}

export interface Run {
  code: number;
  out: string[];
  err: string[];
  stdout: string;
  stderr: string;
}

/** The command line in this process, its output captured. */
export async function cli(argv: readonly string[], env: CliEnv = {}): Promise<Run> {
  const out: string[] = [];
  const err: string[] = [];
  const code = await runCli(argv, { out: (l) => out.push(l), err: (l) => err.push(l) }, '9.9.9', env);
  return { code, out, err, stdout: out.join('\n'), stderr: err.join('\n') };
}

export async function tempDir(prefix: string): Promise<{ dir: string; remove: () => Promise<void> }> {
  const dir = await mkdtemp(path.join(tmpdir(), prefix));
  return { dir, remove: () => rm(dir, { recursive: true, force: true }) };
}

/** Bundles the CLI as build/build.mjs does (one CJS file for node) and returns its path. */
export async function bundleCli(outDir: string): Promise<string> {
  const outfile = path.join(outDir, 'cli', 'quantiscope.cjs');
  await build({
    entryPoints: [path.join(ROOT, 'main/cli/quantiscope.ts')],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'cjs',
    target: 'es2022',
    logLevel: 'warning',
    legalComments: 'none',
    define: { __QUANTISCOPE_VERSION__: JSON.stringify('9.9.9') },
    banner: { js: '#!/usr/bin/env node' },
  });
  return outfile;
}
