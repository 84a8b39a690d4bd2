// Entry point of the headless command line (dist/cli/quantiscope.cjs). The same
// bundle is the analysis worker: runTasks() starts workers from this very file, and
// here a worker started that way serves tasks instead of reading the command line.
import { availableParallelism } from 'node:os';
import { isMainThread, parentPort, workerData } from 'node:worker_threads';
import { runCli } from './run';
import { serveTasks, WORKER_MARK } from './workers';

// Set by build/build.mjs from package.json.
declare const __QUANTISCOPE_VERSION__: string;

const isWorker =
  !isMainThread && parentPort !== null && (workerData as { mark?: unknown } | null)?.mark === WORKER_MARK;

if (isWorker && parentPort !== null) {
  serveTasks(parentPort);
} else {
  const stderr = process.stderr;
  // A reader that stops early (`| head`) is no error of ours: stop quietly.
  process.stdout.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw err;
  });
  void runCli(
    process.argv.slice(2),
    {
      out: (l) => process.stdout.write(`${l}\n`),
      err: (l) => stderr.write(`${l}\n`),
      // Carriage return and erase-to-end-of-line keep the progress on one line.
      status: stderr.isTTY ? (l) => stderr.write(`\r${l}\x1b[K`) : undefined,
    },
    __QUANTISCOPE_VERSION__,
    { cores: availableParallelism(), workerScript: __filename },
  ).then((code) => {
    process.exitCode = code;
  });
}
