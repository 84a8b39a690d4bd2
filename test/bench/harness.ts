// The bench harness: figures register here, each measures its own value and
// a reference in the same run, and the runner prints them as a table or as
// JSON. A new figure registers itself with `registerFigure`.
//
// JSON output (`--json`): one array on stdout, each element
//   { "name": string, "value": number, "unit": string,
//     "reference": { "name": string, "value": number, "unit": string },
//     "ratio": number }        // value / reference.value
// Everything else (progress, notes) goes to stderr, so stdout stays parseable.

export interface Reference {
  /** What was measured as the yardstick, e.g. "alawmulaw mulaw.encode". */
  name: string;
  value: number;
  unit: string;
}

export interface FigureResult {
  name: string;
  value: number;
  unit: string;
  reference: Reference;
  /** value / reference.value. */
  ratio: number;
}

export interface Figure {
  name: string;
  unit: string;
  /** Optional goal for the ratio, shown in the table (not in JSON). */
  targetRatio?: number;
  /** Measures the figure and its reference; called once per run. */
  measure(): { value: number; reference: Reference };
}

const registry: Figure[] = [];

export function registerFigure(figure: Figure): void {
  if (registry.some((f) => f.name === figure.name))
    throw new Error(`bench: duplicate figure "${figure.name}"`);
  registry.push(figure);
}

export function registeredFigures(): readonly Figure[] {
  return registry;
}

export interface TimingOptions {
  /** Untimed calls before measuring, to let the JIT settle. */
  warmupMs: number;
  /** Length of one timed repeat. */
  repeatMs: number;
  /** Timed repeats per contestant; the median is reported. */
  repeats: number;
}

export const DEFAULT_TIMING: TimingOptions = { warmupMs: 150, repeatMs: 40, repeats: 9 };

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 === 1 ? s[m] : (s[m - 1] + s[m]) / 2;
};

/** Calls of `fn` needed for about `ms` milliseconds. */
function calibrate(fn: () => void, ms: number): number {
  let calls = 1;
  for (;;) {
    const t0 = performance.now();
    for (let i = 0; i < calls; i++) fn();
    const dt = performance.now() - t0;
    if (dt >= ms / 4 || calls >= 1 << 24) return Math.max(1, Math.ceil((calls * ms) / Math.max(dt, 1e-3)));
    calls *= 2;
  }
}

/**
 * Throughput of two functions on the same work, in Msamples/s (median of the
 * repeats). Repeats alternate between the two so that drift in clock speed or
 * background load hits both alike.
 */
export function compareThroughput(
  ours: () => void,
  theirs: () => void,
  samplesPerCall: number,
  timing: TimingOptions = DEFAULT_TIMING,
): { ours: number; theirs: number } {
  for (const fn of [ours, theirs]) {
    const t0 = performance.now();
    while (performance.now() - t0 < timing.warmupMs) fn();
  }
  const callsOurs = calibrate(ours, timing.repeatMs);
  const callsTheirs = calibrate(theirs, timing.repeatMs);
  const rateOurs: number[] = [];
  const rateTheirs: number[] = [];
  const timeOne = (fn: () => void, calls: number): number => {
    const t0 = performance.now();
    for (let i = 0; i < calls; i++) fn();
    const seconds = (performance.now() - t0) / 1000;
    return (calls * samplesPerCall) / seconds / 1e6;
  };
  for (let r = 0; r < timing.repeats; r++) {
    rateOurs.push(timeOne(ours, callsOurs));
    rateTheirs.push(timeOne(theirs, callsTheirs));
  }
  return { ours: median(rateOurs), theirs: median(rateTheirs) };
}

/**
 * `--only PATTERN` selects figures whose name contains PATTERN or matches it
 * as a regular expression (both case-insensitive).
 */
export function figureFilter(pattern: string | undefined): (name: string) => boolean {
  if (pattern === undefined) return () => true;
  const lower = pattern.toLowerCase();
  let re: RegExp | undefined;
  try {
    re = new RegExp(pattern, 'i');
  } catch {
    re = undefined;
  }
  return (name) => name.toLowerCase().includes(lower) || (re !== undefined && re.test(name));
}

export function runFigures(figures: readonly Figure[], log: (line: string) => void): FigureResult[] {
  const results: FigureResult[] = [];
  for (const f of figures) {
    const t0 = performance.now();
    const { value, reference } = f.measure();
    results.push({ name: f.name, value, unit: f.unit, reference, ratio: value / reference.value });
    log(`bench: ${f.name} done in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  }
  return results;
}

const fmt = (v: number): string =>
  Math.abs(v) >= 100 ? v.toFixed(0) : Math.abs(v) >= 10 ? v.toFixed(1) : v.toFixed(2);

export function formatTable(results: readonly FigureResult[], figures: readonly Figure[]): string {
  const target = (name: string) => figures.find((f) => f.name === name)?.targetRatio;
  const rows = [
    ['figure', 'value', 'unit', 'reference', 'ref value', 'ratio', 'target'],
    ...results.map((r) => {
      const t = target(r.name);
      return [
        r.name,
        fmt(r.value),
        r.unit,
        r.reference.name,
        `${fmt(r.reference.value)} ${r.reference.unit}`,
        `${r.ratio.toFixed(2)}x`,
        t === undefined ? '' : `>= ${t}x ${r.ratio >= t ? 'met' : 'MISSED'}`,
      ];
    }),
  ];
  const widths = rows[0].map((_, c) => Math.max(...rows.map((row) => row[c].length)));
  const numeric = new Set([1, 4, 5]);
  return rows
    .map((row) =>
      row
        .map((cell, c) => (numeric.has(c) ? cell.padStart(widths[c]) : cell.padEnd(widths[c])))
        .join('  ')
        .trimEnd(),
    )
    .join('\n');
}

export interface BenchArgs {
  json: boolean;
  only?: string;
  help: boolean;
  list: boolean;
}

export function parseBenchArgs(argv: readonly string[]): BenchArgs {
  const args: BenchArgs = { json: false, help: false, list: false };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--json') args.json = true;
    else if (a === '--help' || a === '-h') args.help = true;
    else if (a === '--list') args.list = true;
    else if (a === '--only') {
      if (i + 1 >= argv.length) throw new Error('--only needs a PATTERN');
      args.only = argv[++i];
    } else if (a.startsWith('--only=')) args.only = a.slice('--only='.length);
    else throw new Error(`unknown option "${a}" (try --help)`);
  }
  return args;
}

export const BENCH_USAGE = `usage: npm run bench -- [--json] [--only PATTERN] [--list]
  --json          print one JSON array of { name, value, unit, reference, ratio } on stdout
  --only PATTERN  run only figures whose name contains PATTERN or matches it as a regex (case-insensitive)
  --list          print the figure names and exit`;
