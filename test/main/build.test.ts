// The build's outputs, built into a temporary directory: every bundle there, each with
// only the imports its runtime can satisfy (sandboxed preloads may require only
// 'electron', per Electron's sandbox documentation, from memory; AudioWorklet modules
// cannot import at all here because they are loaded alone by addModule).
import { execFileSync } from 'node:child_process';
import http from 'node:http';
import { mkdtemp, readFile, rm, stat } from 'node:fs/promises';
import { builtinModules } from 'node:module';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildAll } from '../../build/build.mjs';
import { scanImports } from '../../build/layers.mjs';
import { startStaticServer } from '../../main/browser-shell/server';

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
      'renderer/favicon.svg',
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

/** GET over loopback with the Host header the server expects; the body as bytes. */
function get(port: number, rawPath: string): Promise<{ status: number; type?: string; body: Buffer }> {
  return new Promise((resolve, reject) => {
    http
      .get({ host: '127.0.0.1', port, path: rawPath }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (d: Buffer) => chunks.push(d));
        res.on('end', () =>
          resolve({
            status: res.statusCode ?? 0,
            type: res.headers['content-type'],
            body: Buffer.concat(chunks),
          }),
        );
      })
      .on('error', reject);
  });
}

describe('page icon', () => {
  it('is built beside index.html, unchanged, and is an SVG drawn on a 16 px grid', async () => {
    const built = await readFile(path.join(out, 'renderer/favicon.svg'));
    expect(built.equals(await readFile(path.resolve('renderer/favicon.svg')))).toBe(true);
    // The root element and namespace of an SVG document (SVG 1.1, W3C, from memory).
    expect(built.toString('utf8')).toMatch(
      /^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" viewBox="0 0 16 16"/,
    );
  });

  it('is linked from the head of the built page', async () => {
    const html = await read('renderer/index.html');
    const head = html.slice(html.indexOf('<head>'), html.indexOf('</head>'));
    // rel="icon" with the type, so a browser that cannot draw SVG skips it (HTML standard,
    // link type "icon", from memory).
    expect(head).toContain('<link rel="icon" href="favicon.svg" type="image/svg+xml" />');
  });

  it('is served by the loopback server as image/svg+xml, at its name and at /favicon.ico', async () => {
    const server = await startStaticServer({ root: path.join(out, 'renderer'), port: 0 });
    try {
      const icon = await readFile(path.join(out, 'renderer/favicon.svg'));
      for (const p of ['/favicon.svg', '/favicon.ico']) {
        const r = await get(server.port, p);
        expect(r.status, p).toBe(200);
        expect(r.type, p).toBe('image/svg+xml');
        expect(r.body.equals(icon), p).toBe(true);
      }
    } finally {
      await server.close();
    }
  });
});
