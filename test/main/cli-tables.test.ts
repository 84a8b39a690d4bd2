// Stored tables on the command line: design --table-out writes a tables file, --table
// reads it so table:NAME stands for the table's levels, and whatever is written or
// printed as data carries the levels in full.
import { link, mkdir, readdir, readFile, stat, symlink, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DesignReport } from '../../main/cli/commands/design';
import { parseTableFile } from '../../core/spec/table-file';
import { cli, talker, tempDir, writePcm16 } from './cli-fixtures';

let dir: string;
let remove: () => Promise<void>;
const f = (name: string) => path.join(dir, name);
let design: DesignReport;

beforeAll(async () => {
  ({ dir, remove } = await tempDir('qs-tables-'));
  // Invented talker: Laplacian bursts at -20, -26 and -32 dBov with pauses.
  await writePcm16(f('talk.wav'), 8000, talker(8000, 6, 11, [-20, -26, -32]));
  const r = await cli(['design', f('talk.wav'), '--bits', '4', '--table-out', f('t.json'), '--json']);
  expect(r.code, r.stderr).toBe(0);
  design = (JSON.parse(r.stdout) as { design: DesignReport }).design;
});

afterAll(() => remove());

describe('design --table-out', () => {
  it('writes the designed table under its name, and nothing else in the folder', async () => {
    expect(design.tableFile).toBe(f('t.json'));
    const tables = parseTableFile(await readFile(f('t.json'), 'utf8'), 't.json');
    expect(tables).toHaveLength(1);
    const [t] = tables;
    expect(t.name).toBe(design.name);
    expect(t.bits).toBe(4);
    // The positive half in the report is the upper half of the stored odd-symmetric table.
    expect(t.outputs.slice(8)).toEqual(design.outputs);
    expect(t.decisions.slice(8)).toEqual(design.decisions);
    expect(t.note).toMatch(/4 bits at 8000 Hz/);
    // With the overload point the design gave it, its outermost output (DEVELOPERS.md, designed tables).
    expect(t.overloadPoint).toBe(design.outputs[7]);
    // Written to a temporary file and renamed: none is left behind (common practice, no source).
    expect((await readdir(dir)).sort()).toEqual(['t.json', 'talk.wav']);
    const text = await cli(['design', f('talk.wav'), '--bits', '4', '--table-out', f('t2.json')]);
    expect(text.stdout).toContain(`stored as table:${design.name} in ${f('t2.json')}`);
  });

  it('refuses an existing file unless --force, and an input file always, however it is reached', async () => {
    await writeFile(f('old.json'), 'keep');
    const refused = await cli(['design', f('talk.wav'), '--bits', '3', '--table-out', f('old.json')]);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toContain(
      `--table-out ${f('old.json')}: the file exists (give --force to replace it)`,
    );
    expect(await readFile(f('old.json'), 'utf8')).toBe('keep');
    const forced = await cli([
      'design',
      f('talk.wav'),
      '--bits',
      '3',
      '--table-out',
      f('old.json'),
      '--force',
    ]);
    expect(forced.code, forced.stderr).toBe(0);
    expect(parseTableFile(await readFile(f('old.json'), 'utf8'), 'old.json')[0].bits).toBe(3);

    // The input itself: by a path through "..", a symbolic link and a hard link; --force or not.
    await mkdir(f('sub'), { recursive: true });
    await symlink(f('talk.wav'), f('sym.wav'));
    await link(f('talk.wav'), f('hard.wav'));
    const before = await stat(f('talk.wav'));
    for (const out of [path.join(dir, 'sub', '..', 'talk.wav'), f('sym.wav'), f('hard.wav')]) {
      const r = await cli(['design', f('talk.wav'), '--bits', '3', '--table-out', out, '--force']);
      expect(r.code, out).toBe(2);
      expect(r.stderr).toContain(
        `--table-out ${out}: is the input file ${f('talk.wav')}; it is never written over`,
      );
    }
    const after = await stat(f('talk.wav'));
    expect(after.size).toBe(before.size);
    expect(after.mtimeMs).toBe(before.mtimeMs);
  });
});

describe('--table FILE and table:NAME', () => {
  it('analyze gives the same figures for table:NAME as for the full text', async () => {
    const short = await cli([
      'analyze',
      f('talk.wav'),
      '--table',
      f('t.json'),
      '--channel',
      `table:${design.name}`,
      '--json',
    ]);
    expect(short.code, short.stderr).toBe(0);
    const full = await cli(['analyze', f('talk.wav'), '--channel', design.channel, '--json']);
    expect(full.code).toBe(0);
    // The name stands for the very levels (the short form's definition), so every figure agrees,
    // and the JSON names the channel by its full text either way.
    expect(short.stdout).toBe(full.stdout);
    const [result] = JSON.parse(short.stdout) as { channels: { name: string }[] }[];
    expect(result.channels[0].name).toBe(design.channel);
    // CSV carries the full text too; the terminal table shows the name.
    const csv = await cli([
      'analyze',
      f('talk.wav'),
      '--table',
      f('t.json'),
      '-c',
      `table:${design.name}`,
      '--csv',
    ]);
    expect(csv.out[1]).toContain(design.channel.split(',')[0]);
    const human = await cli(['analyze', f('talk.wav'), '--table', f('t.json'), '-c', `table:${design.name}`]);
    expect(human.stdout).toContain(`talker at table:${design.name}:`);
    expect(human.stdout).not.toContain(design.channel);
  });

  it('sweep, compare --ledger and channel take the name too', async () => {
    const sweep = await cli([
      'sweep',
      '--table',
      f('t.json'),
      '-c',
      `table:${design.name}`,
      '--step',
      '10',
      '--json',
    ]);
    expect([0, 1]).toContain(sweep.code);
    expect((JSON.parse(sweep.stdout) as { channel: string }[])[0].channel).toBe(design.channel);
    const ledger = await cli([
      'compare',
      f('talk.wav'),
      f('talk.wav'),
      '--table',
      f('t.json'),
      '--ledger',
      `table:${design.name}`,
      '--json',
    ]);
    expect(ledger.code, ledger.stderr).toBe(0);
    expect((JSON.parse(ledger.stdout) as { ledger: string }).ledger).toBe(design.channel);
    const ch = await cli(['channel', `table:${design.name}@16k`, '--table', f('t.json'), '--json']);
    expect(ch.code).toBe(0);
    expect((JSON.parse(ch.stdout) as { canonical: string }[])[0].canonical).toBe(`${design.channel}@16k`);
  });

  it('refuses a bad tables file naming it, and an unknown name naming the way to give it', async () => {
    await writeFile(f('bad.json'), '{"format": "quantiscope-tables", "version": 1, "tables": [');
    const bad = await cli(['analyze', f('talk.wav'), '--table', f('bad.json'), '-c', 'g711-mu']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(
      new RegExp(`^quantiscope analyze: --table ${f('bad.json')}: not a tables file: not JSON`),
    );
    await writeFile(f('newer.json'), '{"format": "quantiscope-tables", "version": 7, "tables": []}');
    const newer = await cli(['sweep', '--table', f('newer.json'), '-c', 'g711-mu']);
    expect(newer.code).toBe(2);
    expect(newer.stderr).toContain(`--table ${f('newer.json')}: written by a newer Quantiscope`);
    const missing = await cli(['analyze', f('talk.wav'), '--table', f('none.json')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain(`--table ${f('none.json')}: no such file`);
    const twice = await cli(['analyze', f('talk.wav'), '--table', f('t.json'), '--table', f('t2.json')]);
    expect(twice.code).toBe(2);
    expect(twice.stderr).toContain(
      `the table "${design.name}" is in both ${f('t.json')} and ${f('t2.json')}`,
    );
    const unknown = await cli(['analyze', f('talk.wav'), '-c', `table:${design.name}`]);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toContain(`"${design.name}": no stored table of that name is known`);
    expect(unknown.stderr).toContain('give its tables file with --table FILE');
  });
});
