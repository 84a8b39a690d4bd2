// Option parsing in the GNU style, and the help and usage paths of every command.
// The conventions checked (long options with = or a separate value, bundled short
// flags, `--` ending the options, operands anywhere) are those of GNU getopt_long
// and the POSIX utility syntax guidelines (common practice, no source).
import { describe, expect, it } from 'vitest';
import { numberOption, parseArgs, UsageError, type OptionSpec } from '../../main/cli/args';
import { COMMANDS } from '../../main/cli/run';
import { cli } from './cli-fixtures';

const SPECS: OptionSpec[] = [
  { name: 'channel', short: 'c', value: 'SPEC', repeat: true, help: '' },
  { name: 'align', value: 'DBOV', help: '' },
  { name: 'jobs', short: 'j', value: 'N', help: '' },
  { name: 'json', help: '' },
  { name: 'help', short: 'h', help: '' },
];

describe('parseArgs', () => {
  it('takes --name value, --name=value, -x value, -xvalue and operands anywhere', () => {
    const a = parseArgs(
      ['a.wav', '--channel', 'g711-mu', 'b.wav', '--channel=uniform:12', '-c', 'mu:255:8', '-j2', '--json'],
      SPECS,
    );
    expect(a.operands).toEqual(['a.wav', 'b.wav']);
    expect(a.values.get('channel')).toEqual(['g711-mu', 'uniform:12', 'mu:255:8']);
    expect(a.values.get('jobs')).toEqual(['2']);
    expect(a.flags.has('json')).toBe(true);
  });

  it('gives a value option the next word even when it starts with a dash (getopt does)', () => {
    expect(parseArgs(['--align', '-26', 'x.wav'], SPECS).values.get('align')).toEqual(['-26']);
    expect(parseArgs(['--align=-26'], SPECS).values.get('align')).toEqual(['-26']);
  });

  it('bundles short flags and ends options at --', () => {
    const a = parseArgs(['-hj', '3', '--', '--json', '-c'], SPECS);
    expect(a.flags.has('help')).toBe(true);
    expect(a.values.get('jobs')).toEqual(['3']);
    expect(a.flags.has('json')).toBe(false);
    expect(a.operands).toEqual(['--json', '-c']);
    // A lone dash is an operand.
    expect(parseArgs(['-'], SPECS).operands).toEqual(['-']);
  });

  it('refuses unknown options, missing values, values on flags and repeats of single options', () => {
    expect(() => parseArgs(['--bogus'], SPECS)).toThrow(/unknown option --bogus/);
    expect(() => parseArgs(['-x'], SPECS)).toThrow(/unknown option -x/);
    expect(() => parseArgs(['--align'], SPECS)).toThrow(/needs a value/);
    expect(() => parseArgs(['--json=yes'], SPECS)).toThrow(/takes no value/);
    expect(() => parseArgs(['-j', '1', '-j', '2'], SPECS)).toThrow(/given twice/);
    expect(() => parseArgs(['--bogus'], SPECS)).toThrow(UsageError);
  });

  it('checks numbers', () => {
    expect(numberOption('align', '-26')).toBe(-26);
    expect(() => numberOption('jobs', '2.5', { integer: true })).toThrow(/whole number/);
    expect(() => numberOption('jobs', '0', { min: 1 })).toThrow(/at least 1/);
    expect(() => numberOption('align', '-26dB')).toThrow(/needs a number/);
    expect(() => numberOption('align', 'Infinity')).toThrow(/needs a number/);
  });
});

describe('help and usage', () => {
  it('prints help for every command with -h, --help and `help NAME`, exit 0', async () => {
    for (const c of COMMANDS) {
      for (const argv of [
        [c.name, '--help'],
        [c.name, '-h'],
        ['help', c.name],
      ]) {
        const r = await cli(argv);
        expect(r.code, argv.join(' ')).toBe(0);
        expect(r.out[0]).toBe(`Usage: quantiscope ${c.name}${c.synopsis === '' ? '' : ` ${c.synopsis}`}`);
        expect(r.stdout).toContain('--help');
      }
    }
    const top = await cli(['--help']);
    for (const c of COMMANDS) expect(top.stdout).toContain(`  ${c.name} `);
  });

  it('answers usage mistakes with status 2 and a hint, never a stack trace', async () => {
    const cases = [
      ['analyze'],
      ['analyze', 'x.wav', '--bogus'],
      ['analyze', 'x.wav', '--channel', 'mu:abc:8'],
      ['analyze', 'x.wav', '--jobs', '0'],
      ['analyze', 'x.wav', '--json', '--csv'],
      ['analyze', 'x.wav', '--align'],
      ['encode', 'in.wav'],
      ['encode', 'in.wav', 'out.wav', '--law', 'b'],
      ['sweep'],
      ['sweep', '--channel', 'g711-mu', '--mask', '-40:29,-45:24'],
      ['design', 'x.wav'],
      ['compare', 'one.wav'],
    ];
    for (const argv of cases) {
      const r = await cli(argv);
      expect(r.code, argv.join(' ')).toBe(2);
      expect(r.stderr, argv.join(' ')).toMatch(/^quantiscope \w+: .*\(try quantiscope \w+ --help\)$/);
      expect(r.stderr).not.toMatch(/\n\s+at /);
    }
    // The bad part of a channel is named (the spec's own message).
    expect((await cli(['analyze', 'x.wav', '-c', 'mu:abc:8'])).stderr).toContain('abc');
  });
});
