import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createQuantizer } from '../../core/quantizers/index';
import {
  CHANNEL_PRESETS,
  ChannelSpecError,
  channelBitRate,
  formatChannel,
  parseChannel,
  type ChannelSpec,
  type StageSpec,
} from '../../core/spec/index';

function refusal(text: string): ChannelSpecError {
  try {
    parseChannel(text);
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
      ['table:0', 'table:0', /expected table/],
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

  it('parse(format(spec)) gives the spec back (property test, fast-check)', () => {
    const rate = fc.oneof(fc.constant<ChannelSpec['rate']>('native'), fc.integer({ min: 1000, max: 384000 }));
    fc.assert(
      fc.property(fc.array(stage, { minLength: 1, maxLength: 4 }), rate, (stages, r) => {
        const spec: ChannelSpec = { stages, rate: r };
        const clean = JSON.parse(JSON.stringify(spec)) as ChannelSpec; // -0 and undefined keys normalised
        expect(parseChannel(formatChannel(spec))).toEqual(clean);
      }),
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
