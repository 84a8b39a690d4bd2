// Entry of `npm run bench` (bundled to dist/bench/bench.mjs by build/build.mjs).
// Figure modules register themselves on import; add new ones to the list below.
import {
  BENCH_USAGE,
  figureFilter,
  formatTable,
  parseBenchArgs,
  registeredFigures,
  runFigures,
  type BenchArgs,
} from './harness';
import './figures-channel';
import './figures-measure';
import './figures-analysis';
import './figures-cli';
import './figures-offline-render';
import './figures-frame-time';
import './figures-watch-cost';
import { g711Sink } from './figures-g711';
import { quantizerSink } from './figures-quantizers';

function main(argv: readonly string[]): number {
  let args: BenchArgs;
  try {
    args = parseBenchArgs(argv);
  } catch (err) {
    console.error(`bench: ${(err as Error).message}`);
    console.error(BENCH_USAGE);
    return 2;
  }
  if (args.help) {
    console.log(BENCH_USAGE);
    return 0;
  }
  const all = registeredFigures();
  if (args.list) {
    for (const f of all) console.log(f.name);
    return 0;
  }
  const chosen = all.filter((f) => figureFilter(args.only)(f.name));
  if (chosen.length === 0) {
    console.error(`bench: no figure matches "${args.only}"; figures: ${all.map((f) => f.name).join(', ')}`);
    return 1;
  }
  const t0 = performance.now();
  const results = runFigures(chosen, (line) => console.error(line));
  if (args.json) {
    console.log(JSON.stringify(results, null, 2));
  } else {
    console.log(formatTable(results, chosen));
    console.log(
      `bench: ${results.length} figures in ${((performance.now() - t0) / 1000).toFixed(1)} s, node ${process.version}`,
    );
  }
  // Keeps the measured results observable (and so not optimised away).
  if (Number.isNaN(g711Sink() + quantizerSink())) console.error('bench: sink is NaN');
  return 0;
}

process.exitCode = main(process.argv.slice(2));
