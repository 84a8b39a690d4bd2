// A 1 GiB WAV file (float32, 48 kHz, mono: 268 million samples, 93 minutes)
// generated in chunks, read through openAudio to the end and then analysed
// (main/cli/analyze-file.ts, one G.711 channel) in a child process that samples
// its resident memory meanwhile; our requirement is that memory stays flat: under
// 300 MB resident.
// The child is a fresh Node process, so the test runner's own heap does not
// blur the figure. Layout of the header: RIFF specification (from memory),
// built by hand as in test/core/wav-riff.ts.
import { spawnSync } from 'node:child_process';
import { closeSync, mkdtempSync, openSync, rmSync, statfsSync, statSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';
import { afterAll, describe, expect, it } from 'vitest';
import { ascii, fmt, le32 } from '../core/wav-riff';

const root = fileURLToPath(new URL('../..', import.meta.url));
const FILE_BYTES = 2 ** 30;
const RSS_LIMIT = 300 * 1024 * 1024;
const HEADER = 44;
const FRAMES = (FILE_BYTES - HEADER) / 4;
/** Frames whose values the child reports, across chunk boundaries and at the very end. */
const PROBES = [0, 1, 65535, 65536, 65537, 123_456_789, FRAMES - 1];

const dir = mkdtempSync(path.join(tmpdir(), 'qs-wav-large-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** The test signal: a modular ramp of prime period 65521, so a shifted read shows. */
const valueAt = (i: number): number => Math.fround(((i * 40503) % 65521) / 65521 - 0.5);

/** Writes the file in 4 MiB pieces; returns the sum and the sum of squares the reader must find. */
function generate(file: string): { sum: number; sumSq: number } {
  const need = FILE_BYTES * 1.1;
  const fs = statfsSync(dir);
  const free = fs.bavail * fs.bsize;
  if (free < need) {
    throw new Error(
      `wav-large needs ${(need / 2 ** 30).toFixed(1)} GiB free in ${dir}, only ${(free / 2 ** 30).toFixed(2)} GiB`,
    );
  }
  const fd = openSync(file, 'w');
  try {
    const header = Uint8Array.from([
      ...ascii('RIFF'),
      ...le32(FILE_BYTES - 8),
      ...ascii('WAVE'),
      ...fmt({ tag: 3, channels: 1, rate: 48000, bits: 32 }),
      ...ascii('data'),
      ...le32(FRAMES * 4),
    ]);
    expect(header.length).toBe(HEADER);
    writeSync(fd, header);
    const piece = new Float32Array(1 << 20);
    const bytes = new Uint8Array(piece.buffer);
    // One period of the signal, walked with a running index: valueAt(i) = period[i % 65521].
    const period = Float32Array.from({ length: 65521 }, (_, i) => valueAt(i));
    let sum = 0;
    let sumSq = 0;
    let j = 0;
    for (let start = 0; start < FRAMES; start += piece.length) {
      const n = Math.min(piece.length, FRAMES - start);
      for (let k = 0; k < n; k++) {
        const v = period[j];
        if (++j === period.length) j = 0;
        piece[k] = v;
        sum += v;
        sumSq += v * v;
      }
      writeSync(fd, bytes, 0, n * 4);
    }
    return { sum, sumSq };
  } finally {
    closeSync(fd);
  }
}

/** The child: reads everything through openAudio and prints what it saw as JSON. */
const CHILD = `
import { openAudio } from './main/cli/audio-file';
import { analyzeFile } from './main/cli/analyze-file';
async function main() {
  const file = process.argv[2];
  const probes = JSON.parse(process.argv[3]);
  const rss = [process.memoryUsage().rss];
  let started = Date.now();
  const r = await openAudio(file);
  const out = new Float64Array(16384);
  let pos = 0, sum = 0, sumSq = 0, reads = 0;
  const seen = {};
  for (let n; (n = await r.read(out)) > 0; ) {
    for (let k = 0; k < n; k++) { const v = out[k]; sum += v; sumSq += v * v; }
    for (const p of probes) if (p >= pos && p < pos + n) seen[p] = out[p - pos];
    pos += n;
    if (++reads % 64 === 0) rss.push(process.memoryUsage().rss);
  }
  rss.push(process.memoryUsage().rss);
  await r.close();
  const readMs = Date.now() - started;
  // The whole analysis (the commands' analyzeFile, what \`quantiscope analyze\` runs per file).
  started = Date.now();
  const analyzeRss = [];
  let ticks = 0;
  const outcome = await analyzeFile({ file, channels: ['g711-mu'], alignDbov: null }, () => {
    if (++ticks % 64 === 0) analyzeRss.push(process.memoryUsage().rss);
  });
  analyzeRss.push(process.memoryUsage().rss);
  const analysis = { ms: Date.now() - started, seconds: outcome.result.seconds, snrDb: outcome.result.channels[0].snrDb };
  console.log(JSON.stringify({ info: r.info, frames: pos, sum, sumSq, seen, rss, readMs, analysis, analyzeRss }));
}
main().catch((e) => { console.error(String(e && e.message || e)); process.exit(1); });
`;

describe('a 1 GiB WAV file', () => {
  it('reads and analyses to the end in chunks with resident memory under 300 MB', async () => {
    const file = path.join(dir, 'large-float32.wav');
    const t0 = performance.now();
    const expected = generate(file);
    const tGenerated = performance.now();
    expect(statSync(file).size).toBe(FILE_BYTES);

    const driver = path.join(dir, 'read-large.cjs');
    await build({
      stdin: { contents: CHILD, resolveDir: root, loader: 'ts', sourcefile: 'read-large.ts' },
      bundle: true,
      platform: 'node',
      format: 'cjs',
      target: 'es2022',
      outfile: driver,
      logLevel: 'warning',
    });
    const child = spawnSync(process.execPath, [driver, file, JSON.stringify(PROBES)], {
      encoding: 'utf8',
      timeout: 80_000,
    });
    expect(child.error, 'the reader child did not finish in time').toBeUndefined();
    expect(child.stderr).toBe('');
    expect(child.status).toBe(0);
    const got = JSON.parse(child.stdout) as {
      info: { frames: number; sampleRate: number; encoding: string; bitsPerSample: number };
      frames: number;
      sum: number;
      sumSq: number;
      seen: Record<string, number>;
      rss: number[];
      readMs: number;
      analysis: { ms: number; seconds: number; snrDb: number | null };
      analyzeRss: number[];
    };
    expect(got.info).toMatchObject({
      frames: FRAMES,
      sampleRate: 48000,
      encoding: 'float',
      bitsPerSample: 32,
    });
    expect(got.frames).toBe(FRAMES);
    // The same float32 values summed in the same order give the same doubles (IEEE 754 arithmetic).
    expect(got.sum).toBe(expected.sum);
    expect(got.sumSq).toBe(expected.sumSq);
    for (const p of PROBES) expect(got.seen[p], `frame ${p}`).toBe(valueAt(p));
    const peak = Math.max(...got.rss);
    expect(got.rss.length).toBeGreaterThan(100);
    expect(peak).toBeLessThan(RSS_LIMIT);

    // The analysis over the same file: its duration, and mu-law's SNR near the 8-bit
    // companded-PCM figure 6.02 B + 4.77 - 20 log10(ln(1 + mu)) = 38.0 dB for loud
    // signals (Jayant and Noll 1984, mu-law asymptote, from memory); this test signal
    // sits within a few dB of full load, so a little below it.
    const analysisPeak = Math.max(...got.analyzeRss);
    expect(got.analysis.seconds).toBeCloseTo(FRAMES / 48000, 9);
    expect(got.analysis.snrDb).toBeGreaterThan(33);
    expect(got.analysis.snrDb).toBeLessThan(39.5);
    expect(got.analyzeRss.length).toBeGreaterThan(10);
    expect(analysisPeak).toBeLessThan(RSS_LIMIT);
    const mb = (b: number) => (b / 2 ** 20).toFixed(0);
    console.log(
      `wav-large: generated 1 GiB in ${((tGenerated - t0) / 1000).toFixed(1)} s; read ${FRAMES} frames in ` +
        `${(got.readMs / 1000).toFixed(1)} s, peak RSS ${mb(peak)} MB (${got.rss.length} samples); ` +
        `analyze g711-mu in ${(got.analysis.ms / 1000).toFixed(1)} s, SNR ${got.analysis.snrDb?.toFixed(2)} dB, ` +
        `peak RSS ${mb(analysisPeak)} MB (${got.analyzeRss.length} samples)`,
    );
  }, 120_000);
});
