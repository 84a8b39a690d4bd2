// Shared by the engine's browser tests: a fresh build served from loopback, Debian's
// Chromium with extra flags, and the conversions that carry typed arrays out of the page.
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type Browser } from 'playwright-core';
import { expect } from 'vitest';
import { buildAll } from '../../build/build.mjs';
import { startStaticServer, type StaticServer } from '../../main/browser-shell/server';
import { CHROMIUM_FLAGS, CHROMIUM_PATH } from './chromium';

export interface EngineSite {
  dir: string;
  server: StaticServer;
  close(): Promise<void>;
}

export async function serveBuild(prefix: string): Promise<EngineSite> {
  const dir = await mkdtemp(path.join(tmpdir(), prefix));
  await buildAll({ outDir: dir });
  const server = await startStaticServer({ root: path.join(dir, 'renderer'), port: 0 });
  return {
    dir,
    server,
    close: async () => {
      await server.close();
      await rm(dir, { recursive: true, force: true });
    },
  };
}

export function launchWith(extra: string[]): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: [...CHROMIUM_FLAGS, ...extra],
  });
}

/** 16-bit PCM mono WAV (RIFF/WAVE layout, Microsoft 1991). */
export function wavBytes(samples: Float32Array, rate: number): Buffer {
  const data = samples.length * 2;
  const b = Buffer.alloc(44 + data);
  b.write('RIFF', 0, 'ascii');
  b.writeUInt32LE(36 + data, 4);
  b.write('WAVE', 8, 'ascii');
  b.write('fmt ', 12, 'ascii');
  b.writeUInt32LE(16, 16);
  b.writeUInt16LE(1, 20);
  b.writeUInt16LE(1, 22);
  b.writeUInt32LE(rate, 24);
  b.writeUInt32LE(rate * 2, 28);
  b.writeUInt16LE(2, 32);
  b.writeUInt16LE(16, 34);
  b.write('data', 36, 'ascii');
  b.writeUInt32LE(data, 40);
  for (let i = 0; i < samples.length; i++) {
    b.writeInt16LE(Math.max(-32768, Math.min(32767, Math.round(samples[i] * 32768))), 44 + 2 * i);
  }
  return b;
}

export async function writeWav(
  dir: string,
  name: string,
  samples: Float32Array,
  rate: number,
): Promise<string> {
  const file = path.join(dir, name);
  await writeFile(file, wavBytes(samples, rate));
  return file;
}

/** Rebuilds typed arrays that the page packed with packTyped (page side, inlined there). */
export function unpackTyped(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(unpackTyped);
  if (v === null || typeof v !== 'object') return v;
  const o = v as Record<string, unknown>;
  if (typeof o.__typed === 'string' && Array.isArray(o.values)) {
    const values = o.values as number[];
    switch (o.__typed) {
      case 'Float32Array':
        return Float32Array.from(values);
      case 'Float64Array':
        return Float64Array.from(values);
      case 'Int32Array':
        return Int32Array.from(values);
      case 'Uint8Array':
        return Uint8Array.from(values);
      default:
        throw new Error(`unexpected typed array ${String(o.__typed)}`);
    }
  }
  return Object.fromEntries(Object.entries(o).map(([k, x]) => [k, unpackTyped(x)]));
}

/** The page-side packer, as source text for page.evaluate (typed arrays -> tagged plain arrays). */
export const PACK_TYPED = `(function pack(v) {
  if (ArrayBuffer.isView(v)) return { __typed: v.constructor.name, values: Array.from(v) };
  if (Array.isArray(v)) return v.map(pack);
  if (v === null || typeof v !== 'object') return v;
  const out = {};
  for (const k of Object.keys(v)) out[k] = pack(v[k]);
  return out;
})`;

/** expect.poll with room for a loaded machine (two cores, several browsers). */
export function poll<T>(fn: () => T | Promise<T>, options: { timeout?: number } = {}) {
  return expect.poll(fn, { interval: 50, timeout: 10_000, ...options });
}
