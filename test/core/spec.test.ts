import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createQuantizer } from '../../core/quantizers/index';
import {
  bitsOfLevels,
  CHANNEL_PRESETS,
  ChannelSpecError,
  channelBitRate,
  formatChannel,
  fullChannel,
  parseChannel,
  shortChannel,
  storedTable,
  tableLookup,
  type ChannelSpec,
  type StageSpec,
  type TableLookup,
  type TableStage,
} from '../../core/spec/index';

function refusal(text: string, tables?: TableLookup): ChannelSpecError {
  try {
    parseChannel(text, { tables });
  } catch (e) {
    if (e instanceof ChannelSpecError) return e;
    throw e;
  }
  throw new Error(`"${text}" was accepted`);
}

describe('channel specification text form', () => {
  it('reads the short forms', () => {
    expect(parseChannel('g711-mu')).toEqual({ stages: [{ law: 'g711-mu' }], rate: 8000 });
    expect(parseChannel('G711-A')).toEqual({ stages: [{ law: 'g711-a' }], rate: 8000 });
    expect(parseChannel('mu:255:8')).toEqual({ stages: [{ law: 'mu', mu: 255, bits: 8 }], rate: 8000 });
    expect(parseChannel('uniform:12')).toEqual({
      stages: [{ law: 'uniform', bits: 12, form: 'tread' }],
      rate: 8000,
    });
    expect(parseChannel('uniform:16:rise,seg=12,ov=0.5,lc=3@16k')).toEqual({
      stages: [
        { law: 'uniform', bits: 16, form: 'rise', segments: 12, overloadPoint: 0.5, loadCapacityDbm0: 3 },
      ],
      rate: 16000,
    });
    expect(parseChannel('a:87.6:8@native').rate).toBe('native');
    expect(parseChannel('g711-mu,zs').stages[0]).toEqual({ law: 'g711-mu', zeroSuppression: true });
    expect(parseChannel(' g711-mu > g711-a > g711-mu ').stages.map((s) => s.law)).toEqual([
      'g711-mu',
      'g711-a',
      'g711-mu',
    ]);
    expect(parseChannel('uniform:8@11025').rate).toBe(11025);
  });

  it('prints the canonical form, leaving defaults out', () => {
    expect(formatChannel(parseChannel('uniform:12:tread@8k'))).toBe('uniform:12');
    expect(formatChannel(parseChannel('MU:255:8@48000'))).toBe('mu:255:8@48k');
    expect(formatChannel(parseChannel('a:87.6:8,lc=3.14,seg=8'))).toBe('a:87.6:8,seg=8,lc=3.14');
    expect(formatChannel(parseChannel('g711-mu>g711-a'))).toBe('g711-mu>g711-a');
  });

  it('refuses bad text with a message naming the bad part', () => {
    const cases: [string, string, RegExp][] = [
      ['', '', /empty channel specification/],
      ['ulaw', 'ulaw', /unknown law/],
      ['mu:abc:8', 'abc', /mu must be a number/],
      ['mu:255', 'mu:255', /expected mu:MU:BITS/],
      ['mu:-1:8', '-1', /mu must be 0 or more/],
      ['a:0.5:8', '0.5', /A must be 1 or more/],
      ['uniform:17', '17', /bits must be a whole number from 2 to 16/],
      ['uniform:1', '1', /from 2 to 16/],
      ['uniform:8:sideways', 'sideways', /tread or rise/],
      ['uniform:8,seg=0', 'seg=0', /segment count/],
      ['uniform:8,ov=-1', 'ov=-1', /above 0/],
      ['uniform:8,gain=3', 'gain=3', /is not an option of uniform/],
      ['uniform:8,seg=4,seg=5', 'seg=5', /given twice/],
      ['g711-a,zs', 'zs', /is not an option of g711-a/],
      ['g711-mu:8', 'g711-mu:8', /no parameters/],
      ['g711-mu@9x', '9x', /rate must be a number/],
      ['g711-mu@500', '500', /from 1000 to 384000/],
      ['g711-mu@8k@16k', 'g711-mu@8k@16k', /only one @RATE/],
      ['g711-mu>>g711-a', 'g711-mu>>g711-a', /a stage is empty/],
      ['table:1/x:1/2/3', 'x', /decision 2 must be a number/],
      ['table:0', 'table:0', /expected table:NAME or table/],
      ['table:0:1', '0:1', /needs 2 to 65536 output values/],
      ['table:1/0:0/1.5/3', '1/0:0/1.5/3', /decision 2 does not ascend/],
    ];
    for (const [text, part, why] of cases) {
      const e = refusal(text);
      expect(e.message, text).toMatch(why);
      expect(e.part, text).toBe(part);
      if (part !== '') expect(e.message).toContain(`"${part}"`);
    }
    // A table given as data, not text, is refused when built, naming the entry.
    expect(() => createQuantizer({ law: 'table', decisions: [1, 0], outputs: [0, 1.5, 3] })).toThrow(
      /decision 2 does not ascend/,
    );
  });

  // J. Max (1960), Gaussian, 2 bits (from memory), as in test/core/table.test.ts.
  const MAX2 = { decisions: [-0.9816, 0, 0.9816], outputs: [-1.51, -0.4528, 0.4528, 1.51] };
  const MAX2_TEXT = 'table:max2:-0.9816/0/0.9816:-1.51/-0.4528/0.4528/1.51';
  const stored = tableLookup([{ name: 'max2', bits: 2, ...MAX2 }]);

  it('reads table:NAME through a lookup into the full table stage, options and rate kept', () => {
    const spec = parseChannel('table:max2,seg=6,ov=2@16k', { tables: stored });
    expect(spec).toEqual({
      stages: [{ law: 'table', name: 'max2', ...MAX2, segments: 6, overloadPoint: 2 }],
      rate: 16000,
    });
    // The short form prints only when asked; the default carries every level.
    expect(formatChannel(spec, { short: true })).toBe('table:max2,seg=6,ov=2@16k');
    expect(formatChannel(spec)).toBe(`${MAX2_TEXT},seg=6,ov=2@16k`);
    // The full text needs no lookup and reads back to the same channel.
    expect(parseChannel(formatChannel(spec))).toEqual(spec);
    expect(parseChannel('g711-mu>table:max2', { tables: stored }).stages[1]).toEqual({
      law: 'table',
      name: 'max2',
      ...MAX2,
    });
    expect(shortChannel(MAX2_TEXT)).toBe('table:max2');
    expect(fullChannel('table:max2@8k', stored)).toBe(MAX2_TEXT);
    // The lookup's arrays are copied, not shared with the channel.
    const stage = spec.stages[0] as TableStage;
    stage.outputs[0] = 0;
    expect(parseChannel('table:max2', { tables: stored }).stages[0]).toMatchObject(MAX2);
  });

  it('refuses an unknown table name, naming it, with or without a lookup', () => {
    for (const tables of [undefined, stored]) {
      const e = refusal('g711-mu>table:talker-9,seg=4', tables);
      expect(e.part).toBe('talker-9');
      expect(e.message).toMatch(/"talker-9": no stored table of that name is known/);
      expect(e.message).toMatch(/import the tables file that holds it, or give the levels in full/);
    }
    // Names match exactly, case included.
    expect(refusal('table:MAX2', stored).part).toBe('MAX2');
    // A lookup handing back unusable levels is refused as any bad table is.
    const broken: TableLookup = () => ({ decisions: [1, 0], outputs: [0, 1.5, 3] });
    const e = refusal('table:odd', broken);
    expect(e.part).toBe('odd');
    expect(e.message).toMatch(/decision 2 does not ascend/);
  });

  it('takes the full form as written, whatever the lookup holds under its name', () => {
    const other = tableLookup([{ name: 'max2', bits: 1, decisions: [0], outputs: [-1, 1] }]);
    expect(parseChannel(MAX2_TEXT, { tables: other })).toEqual(parseChannel(MAX2_TEXT));
    expect(parseChannel(MAX2_TEXT).stages[0]).toEqual({ law: 'table', name: 'max2', ...MAX2 });
    // An unnamed table has no short form: it prints in full even when asked.
    const bare = parseChannel('table:0:-1/1');
    expect(formatChannel(bare, { short: true })).toBe('table:0:-1/1');
  });

  const stage: fc.Arbitrary<StageSpec> = fc.oneof(
    fc.constant<StageSpec>({ law: 'g711-mu' }),
    fc.constant<StageSpec>({ law: 'g711-mu', zeroSuppression: true }),
    fc.constant<StageSpec>({ law: 'g711-a' }),
    fc.record({
      law: fc.constant('uniform' as const),
      bits: fc.integer({ min: 2, max: 16 }),
      form: fc.constantFrom('tread' as const, 'rise' as const),
    }),
    fc.record(
      {
        law: fc.constant('mu' as const),
        mu: fc.double({ min: 0, max: 1e5, noNaN: true }),
        bits: fc.integer({ min: 2, max: 16 }),
        segments: fc.integer({ min: 1, max: 64 }),
        overloadPoint: fc.double({ min: 1e-3, max: 10, noNaN: true }),
        loadCapacityDbm0: fc.double({ min: -10, max: 10, noNaN: true }),
      },
      { requiredKeys: ['law', 'mu', 'bits'] },
    ),
    fc.record({
      law: fc.constant('a' as const),
      a: fc.double({ min: 1, max: 1e4, noNaN: true }),
      bits: fc.integer({ min: 2, max: 16 }),
    }),
  );

  it('takes the overload point and load capacity stored with a table, unless the text gives its own', () => {
    const designed = tableLookup([
      { name: 'max2', bits: 2, ...MAX2, overloadPoint: 1.51, loadCapacityDbm0: 6.72 },
    ]);
    const spec = parseChannel('table:max2', { tables: designed });
    expect(spec.stages[0]).toEqual({
      law: 'table',
      name: 'max2',
      ...MAX2,
      overloadPoint: 1.51,
      loadCapacityDbm0: 6.72,
    });
    expect(parseChannel('table:max2,ov=2', { tables: designed }).stages[0]).toMatchObject({
      overloadPoint: 2,
      loadCapacityDbm0: 6.72,
    });
    // The short form leaves out only what the stored table supplies.
    expect(shortChannel('table:max2,ov=2,seg=4', designed)).toBe('table:max2,seg=4,ov=2');
    expect(formatChannel(spec, { short: true })).toBe('table:max2,ov=1.51,lc=6.72');
    expect(formatChannel(spec, { short: true, tables: designed })).toBe('table:max2');
    expect(fullChannel('table:max2', designed)).toBe(`${MAX2_TEXT},ov=1.51,lc=6.72`);
    // A table whose levels differ from the stored ones under its name cannot be shortened.
    const other = parseChannel('table:max2:0:-1/1');
    expect(formatChannel(other, { short: true, tables: designed })).toBe('table:max2:0:-1/1');
    // Nor one without the ov the stored table would fill in.
    expect(formatChannel(parseChannel(MAX2_TEXT), { short: true, tables: designed })).toBe(MAX2_TEXT);
  });

  // Tables: ascending outputs on a 1/1024 grid (exact in binary), each decision the midpoint
  // of its two outputs, so every output lies inside its own cell as checkTable requires.
  const table: fc.Arbitrary<TableStage> = fc
    .record(
      {
        steps: fc.array(fc.integer({ min: 1, max: 4000 }), { minLength: 2, maxLength: 17 }),
        shift: fc.integer({ min: -40000, max: 40000 }),
        named: fc.boolean(),
        segments: fc.integer({ min: 1, max: 64 }),
        overloadPoint: fc.double({ min: 1e-3, max: 10, noNaN: true }),
        loadCapacityDbm0: fc.double({ min: -10, max: 10, noNaN: true }),
      },
      { requiredKeys: ['steps', 'shift', 'named'] },
    )
    .map(({ steps, shift, named, ...options }) => {
      let at = shift;
      const outputs = steps.map((d) => (at += d) / 1024);
      const decisions = outputs.slice(1).map((y, i) => (outputs[i] + y) / 2);
      const t: TableStage = { law: 'table', decisions, outputs, ...options };
      if (named) t.name = 'pending';
      return t;
    });

  it('parse(format(spec)) gives the spec back, in full and in the short form (property test, fast-check)', () => {
    const rate = fc.oneof(fc.constant<ChannelSpec['rate']>('native'), fc.integer({ min: 1000, max: 384000 }));
    fc.assert(
      fc.property(
        fc.array(fc.oneof(stage, table), { minLength: 1, maxLength: 4 }),
        rate,
        fc.boolean(),
        (stages, r, keepOptions) => {
          // Each named table gets a name of its own, so one lookup holds them all.
          const named = stages.map((s, k) =>
            s.law === 'table' && s.name !== undefined ? { ...s, name: `t-${k}` } : s,
          );
          const spec: ChannelSpec = { stages: named, rate: r };
          const clean = JSON.parse(JSON.stringify(spec)) as ChannelSpec; // -0 and undefined keys normalised
          // The default form carries every level, so it reads back with no lookup at all.
          expect(parseChannel(formatChannel(spec))).toEqual(clean);
          // Stored as the design stores them: levels, and (or not) the stage's ov and lc; from the
          // normalised spec, as a tables file (JSON) holds them.
          const tables = tableLookup(
            clean.stages.flatMap((s) =>
              s.law === 'table' && s.name !== undefined
                ? [
                    keepOptions
                      ? storedTable(s)
                      : {
                          name: s.name,
                          bits: bitsOfLevels(s.outputs.length),
                          decisions: s.decisions,
                          outputs: s.outputs,
                        },
                  ]
                : [],
            ),
          );
          // Short with or without the stored tables to leave out what they hold: both read back.
          const short = formatChannel(spec, { short: true });
          expect(parseChannel(short, { tables })).toEqual(clean);
          const shorter = formatChannel(spec, { short: true, tables });
          expect(parseChannel(shorter, { tables })).toEqual(clean);
          expect(shorter.length).toBeLessThanOrEqual(short.length);
          // Without the lookup the short form of a named table is refused, never misread.
          const hasNamed = named.some((s) => s.law === 'table' && s.name !== undefined);
          if (hasNamed) expect(() => parseChannel(short)).toThrow(/no stored table of that name/);
          else expect(short).toBe(formatChannel(spec));
        },
      ),
      { numRuns: 2000 },
    );
  });

  it('every preset parses, builds, and states its bit rate (G.711: 64 kbit/s, ITU-T G.711)', () => {
    for (const p of CHANNEL_PRESETS) {
      const spec = parseChannel(p.text);
      for (const s of spec.stages)
        expect(createQuantizer(s).label).toBe(formatChannel({ stages: [s], rate: 8000 }));
      expect(formatChannel(spec)).toBe(p.text);
    }
    expect(channelBitRate(parseChannel('g711-mu'))).toBe(64000);
    expect(channelBitRate(parseChannel('uniform:16@16k'))).toBe(256000);
    expect(channelBitRate(parseChannel('mu:100:7'))).toBe(56000);
    expect(channelBitRate(parseChannel('uniform:12@native'))).toBe(null);
    expect(channelBitRate(parseChannel('uniform:12@native'), 48000)).toBe(576000);
  });
});
