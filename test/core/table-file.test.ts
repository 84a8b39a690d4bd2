// The tables file: designed tables kept under a name, read back exactly, and every
// malformed file refused with one line that names the file, the table and the problem.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { designLloydMax } from '../../core/design/lloyd-max';
import { laplacianDesignDensity } from '../../core/design/design-density';
import {
  parseTableFile,
  storedTable,
  TableFileError,
  tableFileText,
  type StoredTable,
} from '../../core/spec/index';

// J. Max (1960), Gaussian, 2 bits (from memory), as in test/core/table.test.ts.
const MAX2: StoredTable = {
  name: 'max2',
  bits: 2,
  decisions: [-0.9816, 0, 0.9816],
  outputs: [-1.51, -0.4528, 0.4528, 1.51],
  overloadPoint: 1.51,
  note: 'Gaussian, unit variance',
  created: '2024-01-01T00:00:00Z',
};

function doc(tables: unknown, extra: Record<string, unknown> = {}): string {
  return JSON.stringify({ format: 'quantiscope-tables', version: 1, tables, ...extra });
}

function refusal(text: string): string {
  try {
    parseTableFile(text, 'lib.json');
  } catch (e) {
    if (e instanceof TableFileError) return e.message;
    throw e;
  }
  throw new Error(`accepted: ${text}`);
}

describe('tables file', () => {
  it('reads back exactly what it wrote, designed levels included', () => {
    // A Lloyd-Max table's levels are arbitrary doubles: JSON's shortest round-trip form keeps
    // every bit (ECMAScript Number::toString, from memory).
    const designed = storedTable(designLloydMax(laplacianDesignDensity(0.1), 4, { name: 'lap-4' }).stage, {
      note: 'Laplacian, sigma 0.1',
    });
    expect(designed.bits).toBe(4);
    // A designed table keeps its overload point (its outermost output) and load capacity.
    expect(designed.overloadPoint).toBe(designed.outputs[15]);
    expect(designed.loadCapacityDbm0).toBeCloseTo(3.14 + 20 * Math.log10(designed.outputs[15]), 12);
    const tables = [MAX2, designed];
    const text = tableFileText(tables);
    expect(parseTableFile(text, 'lib.json')).toEqual(tables);
    // Plain JSON (RFC 8259) of our own layout, readable by any JSON reader.
    const plain = JSON.parse(text) as { format: string; version: number; tables: StoredTable[] };
    expect(plain.format).toBe('quantiscope-tables');
    expect(plain.version).toBe(1);
    expect(plain.tables[1].outputs).toEqual(designed.outputs);
    expect(parseTableFile(tableFileText([]), 'empty.json')).toEqual([]);
    // Fields this version does not know are skipped, not refused.
    expect(parseTableFile(doc([{ ...MAX2, colour: 'red' }], { app: 'x' }), 'lib.json')).toEqual([MAX2]);
  });

  it('refuses a malformed file with the file, the table and the reason', () => {
    const { note: _n, created: _c, ...bare } = MAX2;
    const cases: [string, RegExp][] = [
      ['{"format": ', /^lib\.json: not a tables file: not JSON \(/],
      ['[1, 2]', /^lib\.json: not a tables file: expected a JSON object$/],
      [
        doc([], { format: 'other' }),
        /^lib\.json: not a tables file: "format" is "other", expected "quantiscope-tables"$/,
      ],
      [
        doc([], { version: 2 }),
        /^lib\.json: written by a newer Quantiscope \(tables file version 2; this one reads version 1\)$/,
      ],
      [doc([], { version: '1' }), /^lib\.json: "version" must be a whole number from 1 \(got "1"\)$/],
      [doc({}), /^lib\.json: "tables" must be a list$/],
      [doc([bare, 3]), /^lib\.json: table 2: is not an object$/],
      [doc([{ ...bare, name: undefined }]), /^lib\.json: table 1: has no "name"$/],
      [doc([{ ...bare, name: '4bit' }]), /^lib\.json: table 1: "4bit" is not a table name/],
      [doc([{ ...bare, outputs: undefined }]), /^lib\.json: table 1 \("max2"\): has no "outputs"$/],
      [
        doc([{ ...bare, outputs: [-1, 'x', 1, 2] }]),
        /^lib\.json: table 1 \("max2"\): output 2 is not a finite number \("x"\)$/,
      ],
      [
        doc([{ ...bare, decisions: [-0.9816, -1, 0.9816] }]),
        /^lib\.json: table 1 \("max2"\): decision 2 does not ascend$/,
      ],
      [doc([{ ...bare, bits: 3 }]), /^lib\.json: table 1 \("max2"\): "bits" is 3, but 4 levels take 2$/],
      [doc([{ ...bare, note: 7 }]), /^lib\.json: table 1 \("max2"\): "note" must be text$/],
      [
        doc([{ ...bare, overloadPoint: 0 }]),
        /^lib\.json: table 1 \("max2"\): "overloadPoint" must be a finite number above 0 \(got 0\)$/,
      ],
      [
        doc([{ ...bare, loadCapacityDbm0: '3' }]),
        /^lib\.json: table 1 \("max2"\): "loadCapacityDbm0" must be a finite number \(got "3"\)$/,
      ],
      [doc([bare, bare]), /^lib\.json: table 2: the name "max2" is used twice$/],
    ];
    for (const [text, why] of cases) expect(refusal(text), text).toMatch(why);
    // 1e400 is valid JSON syntax (RFC 8259 section 6 sets no range, from memory) but no finite level.
    expect(refusal(doc([bare]).replace('1.51]', '1e400]'))).toMatch(/output 4 is not a finite number/);
  });

  it('will not write what it could not read back', () => {
    expect(() => tableFileText([{ ...MAX2, bits: 5 }])).toThrow(/"bits" is 5, but 4 levels take 2/);
    expect(() => tableFileText([{ ...MAX2, outputs: [NaN, 0, 1, 2] }])).toThrow(
      /output 1 is not a finite number/,
    );
    expect(() => tableFileText([MAX2, MAX2])).toThrow(/used twice/);
  });

  it('answers any malformed input with one line naming the file, never anything else (fuzz, fast-check)', () => {
    const good = tableFileText([MAX2]);
    const check = (text: string) => {
      try {
        const got = parseTableFile(text, 'fuzz.json');
        expect(Array.isArray(got)).toBe(true);
      } catch (e) {
        expect(e).toBeInstanceOf(TableFileError);
        const m = (e as Error).message;
        expect(m.startsWith('fuzz.json: ')).toBe(true);
        expect(m).not.toMatch(/\n/);
        expect(m.length).toBeLessThan(300);
      }
    };
    // Any text, any JSON value, the good file cut short or with a byte changed, and the good
    // document with any of its values replaced by any JSON value.
    fc.assert(fc.property(fc.string({ maxLength: 200 }), check), { numRuns: 500 });
    fc.assert(fc.property(fc.json({ maxDepth: 4 }), check), { numRuns: 500 });
    fc.assert(
      fc.property(fc.nat({ max: good.length }), fc.string({ maxLength: 3 }), (at, s) => {
        check(good.slice(0, at));
        check(good.slice(0, at) + s + good.slice(at + 1));
      }),
      { numRuns: 1000 },
    );
    const paths: ((
      d: { tables: Record<string, unknown>[] } & Record<string, unknown>,
      v: unknown,
    ) => void)[] = [
      (d, v) => (d.format = v),
      (d, v) => (d.version = v),
      (d, v) => (d.tables = v as never),
      (d, v) => (d.tables[0] = v as never),
      (d, v) => (d.tables[0].name = v),
      (d, v) => (d.tables[0].bits = v),
      (d, v) => (d.tables[0].decisions = v),
      (d, v) => (d.tables[0].outputs = v),
      (d, v) => ((d.tables[0].outputs as unknown[])[2] = v),
      (d, v) => (d.tables[0].note = v),
      (d, v) => (d.tables[0].overloadPoint = v),
      (d, v) => (d.tables[0].loadCapacityDbm0 = v),
      (d, v) => (d.tables[0].created = v),
    ];
    fc.assert(
      fc.property(fc.integer({ min: 0, max: paths.length - 1 }), fc.jsonValue({ maxDepth: 3 }), (p, v) => {
        const d = JSON.parse(good) as { tables: Record<string, unknown>[] } & Record<string, unknown>;
        paths[p](d, v);
        check(JSON.stringify(d));
      }),
      { numRuns: 2000 },
    );
  });
});
