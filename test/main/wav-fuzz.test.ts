// Fuzzing the file reader (fast-check): mutated headers and bodies of valid
// files of several formats are written to disk and read through openAudio to
// the end. Each must be read or refused with an AudioFileError naming the
// file, never crash with another error, and never take long (no hang).
// Source of the requirement: ours, bad input is refused, never a crash (common practice, no source).
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { AudioFileError, openAudio } from '../../main/cli/audio-file';
import { ascii, chunk, extensibleFmt, f32, f64, fmt, le16, le24, le32, riff } from '../core/wav-riff';

const dir = mkdtempSync(path.join(tmpdir(), 'qs-wav-fuzz-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const RUNS = 5000;
/** A case that takes this long is a hang for files of a few hundred bytes. */
const SLOW_MS = 2000;

const tone = (n: number) => Array.from({ length: n }, (_, i) => Math.sin(i * 0.37) * 0.8);
const list = chunk('LIST', [...ascii('INFO'), ...chunk('ICMT', [...ascii('fuzz'), 0])]);

/** Valid seeds (RIFF layout from test/core/wav-riff.ts, from memory). */
const SEEDS: Uint8Array[] = [
  riff([
    fmt({ tag: 1, channels: 1, rate: 8000, bits: 8 }),
    chunk(
      'data',
      tone(41).map((x) => Math.round(x * 127) + 128),
    ),
  ]),
  riff([
    fmt({ tag: 1, channels: 2, rate: 44100, bits: 16 }),
    list,
    chunk(
      'data',
      tone(60).flatMap((x) => le16(Math.round(x * 32767) & 0xffff)),
    ),
  ]),
  riff([
    fmt({ tag: 1, channels: 1, rate: 48000, bits: 24 }),
    chunk(
      'data',
      tone(33).flatMap((x) => le24(x * 2 ** 23)),
    ),
  ]),
  riff([
    fmt({ tag: 1, channels: 1, rate: 96000, bits: 32 }),
    chunk(
      'data',
      tone(30).flatMap((x) => le32(x * 2 ** 31)),
    ),
  ]),
  riff([
    fmt({ tag: 3, channels: 1, rate: 48000, bits: 32, extra: le16(0) }),
    chunk('fact', le32(40)),
    chunk('data', tone(40).flatMap(f32)),
  ]),
  riff([fmt({ tag: 3, channels: 2, rate: 192000, bits: 64 }), chunk('data', tone(20).flatMap(f64))]),
  riff([
    fmt({ tag: 7, channels: 1, rate: 8000, bits: 8, extra: le16(0) }),
    chunk('fact', le32(51)),
    chunk(
      'data',
      tone(51).map((_, i) => (i * 29) & 0xff),
    ),
  ]),
  riff([
    fmt({ tag: 6, channels: 1, rate: 8000, bits: 8, extra: le16(0) }),
    chunk('junk', [1, 2, 3]),
    chunk(
      'data',
      tone(50).map((_, i) => (i * 31) & 0xff),
    ),
  ]),
  riff([
    extensibleFmt({ subTag: 1, channels: 2, rate: 48000, bits: 32, validBits: 24, mask: 3 }),
    chunk(
      'data',
      tone(24).flatMap((x) => le32(x * 2 ** 31)),
    ),
  ]),
  riff([
    extensibleFmt({ subTag: 3, channels: 1, rate: 16000, bits: 32, validBits: 32 }),
    chunk('data', tone(25).flatMap(f32)),
  ]),
  riff([
    extensibleFmt({ subTag: 7, channels: 1, rate: 8000, bits: 8, validBits: 8 }),
    chunk('fact', le32(9)),
    chunk('data', [0, 1, 2, 3, 4, 5, 6, 7, 8]),
  ]),
];

/** Offsets of interest in a seed: the RIFF size, each chunk's id and size, the fmt fields. */
function fieldOffsets(file: Uint8Array): number[] {
  const at = [4, 8];
  for (let pos = 12; pos + 8 <= file.length;) {
    const size = (file[pos + 4] | (file[pos + 5] << 8) | (file[pos + 6] << 16) | (file[pos + 7] << 24)) >>> 0;
    at.push(pos, pos + 4);
    if (String.fromCharCode(...file.subarray(pos, pos + 4)) === 'fmt ') {
      for (const f of [0, 2, 4, 8, 12, 14, 16, 18, 24]) at.push(pos + 8 + f);
    }
    pos += 8 + size + (size & 1);
  }
  return at;
}

type Mutation =
  | { kind: 'flip'; at: number; mask: number }
  | { kind: 'set16'; field: number; value: number }
  | { kind: 'set32'; field: number; value: number; delta: boolean }
  | { kind: 'truncate'; at: number }
  | { kind: 'insert'; at: number; field: boolean; id: number[]; size: number; body: number[] };

const INTERESTING_32 = [0, 1, 2, 3, 4, 7, 8, 15, 16, 18, 40, 0x7fffffff, 0x80000000, 0xfffffffe, 0xffffffff];
const INTERESTING_16 = [0, 1, 2, 3, 6, 7, 8, 12, 16, 24, 32, 64, 0xfffe, 0xffff, 0x8000];

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('flip' as const), at: fc.nat(), mask: fc.integer({ min: 1, max: 255 }) }),
  fc.record({
    kind: fc.constant('set16' as const),
    field: fc.nat(),
    value: fc.oneof(fc.constantFrom(...INTERESTING_16), fc.integer({ min: 0, max: 0xffff })),
  }),
  fc.record({
    kind: fc.constant('set32' as const),
    field: fc.nat(),
    value: fc.oneof(fc.constantFrom(...INTERESTING_32), fc.integer({ min: -3, max: 3 }), fc.nat()),
    delta: fc.boolean(),
  }),
  fc.record({ kind: fc.constant('truncate' as const), at: fc.nat() }),
  fc.record({
    kind: fc.constant('insert' as const),
    at: fc.nat(),
    field: fc.boolean(),
    id: fc.oneof(
      fc.constantFrom(...['fmt ', 'data', 'LIST', 'fact', 'RIFF', 'junk'].map(ascii)),
      fc.array(fc.integer({ min: 0, max: 255 }), { minLength: 4, maxLength: 4 }),
    ),
    size: fc.oneof(fc.nat({ max: 64 }), fc.constantFrom(...INTERESTING_32)),
    body: fc.array(fc.integer({ min: 0, max: 255 }), { maxLength: 48 }),
  }),
);

function mutate(seed: Uint8Array, steps: Mutation[]): Uint8Array {
  let b = Array.from(seed);
  for (const m of steps) {
    const fields = fieldOffsets(Uint8Array.from(b));
    const pick = (n: number) => fields[n % fields.length];
    switch (m.kind) {
      case 'flip':
        if (b.length) b[m.at % b.length] ^= m.mask;
        break;
      case 'set16': {
        const at = pick(m.field);
        le16(m.value).forEach((v, k) => at + k < b.length && (b[at + k] = v));
        break;
      }
      case 'set32': {
        const at = pick(m.field);
        const old = (b[at] | (b[at + 1] << 8) | (b[at + 2] << 16) | (b[at + 3] << 24)) >>> 0;
        le32(m.delta ? old + m.value : m.value).forEach((v, k) => at + k < b.length && (b[at + k] = v));
        break;
      }
      case 'truncate':
        b = b.slice(0, m.at % (b.length + 1));
        break;
      case 'insert': {
        const at = m.field ? pick(m.at) : m.at % (b.length + 1);
        const inserted = [...m.id, ...le32(m.size), ...m.body];
        b = [...b.slice(0, at), ...inserted, ...b.slice(at)];
        break;
      }
    }
  }
  return Uint8Array.from(b);
}

describe('reader fuzz', () => {
  it(`${RUNS} mutated files: each read to the end or refused with an AudioFileError, none slow`, async () => {
    const file = path.join(dir, 'case.wav');
    let read = 0;
    let refused = 0;
    let slowest = 0;
    const reasons = new Set<string>();
    await fc.assert(
      fc.asyncProperty(
        fc.nat({ max: SEEDS.length - 1 }),
        fc.array(mutation, { minLength: 1, maxLength: 4 }),
        fc.constantFrom(1, 7, 64, 65536),
        fc.constantFrom(1, 5, 300),
        fc.constantFrom(0, 0, 0, 1),
        fc.constantFrom(undefined, undefined, undefined, undefined, 'mu' as const),
        async (seedIndex, steps, chunkFrames, block, channel, raw) => {
          writeFileSync(file, mutate(SEEDS[seedIndex], steps));
          const started = performance.now();
          try {
            const r = await openAudio(file, { chunkFrames, channel, raw });
            const out = new Float64Array(block);
            let total = 0;
            try {
              for (let n; (n = await r.read(out)) > 0;) {
                total += n;
                for (let i = 0; i < n; i++) {
                  // Finite always; integer and G.711 formats within [-1, 1) (their full scale).
                  if (!Number.isFinite(out[i])) throw new Error(`non-finite value ${out[i]} delivered`);
                  if (r.info.encoding !== 'float' && (out[i] < -1 || out[i] >= 1)) {
                    throw new Error(`value ${out[i]} outside full scale for ${r.info.encoding}`);
                  }
                }
              }
            } finally {
              await r.close();
            }
            expect(total).toBe(r.info.frames);
            read++;
          } catch (err) {
            if (!(err instanceof AudioFileError)) throw err;
            expect(err.file).toBe(file);
            expect(err.message.startsWith(`${file}: `)).toBe(true);
            expect(err.problem.length).toBeGreaterThan(0);
            expect(err.problem).not.toMatch(/\n/);
            reasons.add(
              err.problem
                .replace(/\{[^}]*\}|"[^"]*"|0x[0-9A-F]+|-?\d+(\.\d+)?|(-?Infinity|NaN)(?=;)/g, '_')
                .replace(/ \(MPEG.*?\)| \(.*?ADPCM\)| \(GSM.*?\)/, ''),
            );
            refused++;
          }
          const elapsed = performance.now() - started;
          slowest = Math.max(slowest, elapsed);
          expect(elapsed).toBeLessThan(SLOW_MS);
        },
      ),
      { numRuns: RUNS },
    );
    expect(read + refused).toBe(RUNS);
    // The mutations reach both outcomes and a spread of refusals, so the fuzz is not trivially one-sided.
    expect(read).toBeGreaterThan(RUNS / 20);
    expect(refused).toBeGreaterThan(RUNS / 4);
    expect(reasons.size).toBeGreaterThan(15);
    console.log(
      `wav fuzz: ${read} read, ${refused} refused, ${reasons.size} kinds of refusal, slowest ${slowest.toFixed(1)} ms`,
    );
  }, 60_000);
});
