// Entry point of the headless command line (dist/cli/quantiscope.cjs).
import { runCli } from './run';

// Set by build/build.mjs from package.json.
declare const __QUANTISCOPE_VERSION__: string;

process.exitCode = runCli(
  process.argv.slice(2),
  { out: (l) => process.stdout.write(`${l}\n`), err: (l) => process.stderr.write(`${l}\n`) },
  __QUANTISCOPE_VERSION__,
);
