// The bundled command line as a user runs it (bundled into a temporary directory
// the way build/build.mjs does), and parallel analysis on worker_threads: the same
// JSON, to the byte, as a serial run.
import { execFile } from 'node:child_process';
import { writeFile } from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Progress, PROGRESS_DELAY_MS } from '../../main/cli/progress';
import { bundleCli, cli, talker, tempDir, wavFile, writePcm16 } from './cli-fixtures';

let dir: string;
let remove: () => Promise<void>;
let script: string;
const f = (name: string) => path.join(dir, name);

interface Proc {
  code: number;
  stdout: string;
  stderr: string;
}

function runBundled(argv: readonly string[]): Promise<Proc> {
  return new Promise((resolve) => {
    execFile(process.execPath, [script, ...argv], { maxBuffer: 1 << 26 }, (err, stdout, stderr) => {
      const code = err === null ? 0 : typeof err.code === 'number' ? err.code : -1;
      resolve({ code, stdout, stderr });
    });
  });
}

beforeAll(async () => {
  ({ dir, remove } = await tempDir('qs-cli-e2e-'));
  script = await bundleCli(dir);
  await writePcm16(f('a.wav'), 48000, talker(48000, 4, 1, [-24, -30, -18]));
  await writePcm16(f('b.wav'), 44100, talker(44100, 3, 2, [-35, -26]));
  await writePcm16(f('c.wav'), 8000, talker(8000, 5, 3, [-20, -28, -40]));
  await writeFile(f('nan.wav'), floatWavWithNanAtEnd(48000, talker(48000, 6, 4, [-24])));
});

/** 32-bit float WAV (format tag 3, Microsoft RIFF, from memory) whose last sample is NaN: refused only at the end. */
function floatWavWithNanAtEnd(rate: number, x: Float64Array): Uint8Array {
  const data = new DataView(new ArrayBuffer(4 * x.length));
  for (let i = 0; i < x.length; i++) data.setFloat32(4 * i, i === x.length - 1 ? NaN : x[i], true);
  return wavFile({ tag: 3, channels: 1, rate, bits: 32 }, new Uint8Array(data.buffer));
}

afterAll(() => remove());

const FILES = () => [f('a.wav'), f('b.wav'), f('c.wav')];
const CHANNELS = ['-c', 'g711-mu', '-c', 'g711-mu>g711-a', '-c', 'uniform:12@16k'];

describe('parallel analysis', () => {
  it('gives the JSON of a serial run, byte for byte, in file order', async () => {
    const aligned = (jobs: string) =>
      runBundled(['analyze', ...FILES(), ...CHANNELS, '--align', '-26', '--json', '--jobs', jobs]);
    const serial = await aligned('1');
    const parallel = await aligned('2');
    expect(serial.code).toBe(0);
    expect(parallel.code).toBe(0);
    expect(serial.stderr).toBe('');
    expect(parallel.stdout).toBe(serial.stdout);
    const files = (JSON.parse(parallel.stdout) as { file: string }[]).map((r) => r.file);
    expect(files).toEqual(FILES());
  });

  it('in process, with workers started from the bundle: the same as in this thread', async () => {
    // The NaN file fails only at its end, long after the missing one would in parallel.
    const argv = ['analyze', f('nan.wav'), f('gone.wav'), ...FILES(), ...CHANNELS, '--json'];
    const serial = await cli(argv, { cores: 1 });
    const parallel = await cli(argv, { cores: 2, workerScript: script });
    expect(parallel.code).toBe(1);
    expect(parallel.stdout).toBe(serial.stdout);
    // Failures are named in file order either way.
    expect(parallel.err).toEqual(serial.err);
    expect(serial.err[0]).toMatch(
      new RegExp(`^quantiscope analyze: ${f('nan.wav')}: sample 287999 .* is NaN`),
    );
    expect(serial.err[1]).toBe(`quantiscope analyze: ${f('gone.wav')}: no such file`);
  });
});

describe('the bundled command line', () => {
  it('names a missing file among good ones, exits 1, prints no stack trace', async () => {
    const r = await runBundled(['analyze', f('a.wav'), f('nope.wav'), '--csv']);
    expect(r.code).toBe(1);
    expect(r.stdout.trim().split('\n')).toHaveLength(2);
    expect(r.stderr).toBe(
      `quantiscope analyze: ${f('nope.wav')}: no such file\nquantiscope analyze: 1 of 2 files failed\n`,
    );
  });

  it('answers --version, --help and usage mistakes', async () => {
    expect((await runBundled(['--version'])).stdout).toBe('9.9.9\n');
    const help = await runBundled(['sweep', '--help']);
    expect(help.code).toBe(0);
    expect(help.stdout).toMatch(/^Usage: quantiscope sweep --channel SPEC/);
    const bad = await runBundled(['analyze', '--frobnicate']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toBe(
      'quantiscope analyze: unknown option --frobnicate (try quantiscope analyze --help)\n',
    );
  });

  it('shows no progress line when stderr is not a terminal', async () => {
    const r = await runBundled(['analyze', ...FILES(), '--jobs', '2']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout).not.toContain('\r');
  });
});

describe('progress line', () => {
  it('stays quiet for the first second, then updates at most ten times a second, and is wiped', () => {
    let t = 0;
    const lines: string[] = [];
    const p = new Progress(
      (l) => lines.push(l),
      'analyze',
      () => t,
    );
    p.update(0.1);
    t = PROGRESS_DELAY_MS - 1;
    p.update(0.2);
    expect(lines).toEqual([]);
    t = PROGRESS_DELAY_MS;
    p.update(0.25, '(0/2 files)');
    t += 50;
    p.update(0.3);
    t += 100;
    p.update(0.5);
    p.done();
    expect(lines).toEqual(['analyze:  25% (0/2 files)', 'analyze:  50%', '']);
    // Without a terminal there is no sink, and nothing happens.
    const quiet = new Progress(undefined, 'analyze', () => 1e9);
    quiet.update(0.5);
    quiet.done();
  });
});
