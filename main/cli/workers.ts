// Files analysed in parallel on worker_threads. The workers run the same bundled
// script as the command line itself (dist/cli/quantiscope.cjs starts a worker of
// its own file, and quantiscope.ts serves tasks when it finds itself in one), so
// they run the very code a serial run does and give the same figures to the bit.
// Results come back in the order the tasks were given, whatever order they finish in.
import { Worker } from 'node:worker_threads';
import { analyzeFile, type AnalyzeOutcome, type AnalyzeTask } from './analyze-file';
import { reasonOf } from './input';

/** Marks a worker started by this pool (quantiscope.ts checks it). */
export const WORKER_MARK = 'quantiscope-analysis-worker';

export type Settled = { ok: true; value: AnalyzeOutcome } | { ok: false; file: string; reason: string };

interface ToWorker {
  id: number;
  task: AnalyzeTask;
}

type FromWorker =
  | { id: number; kind: 'progress'; done: number; total: number }
  | { id: number; kind: 'done'; value: AnalyzeOutcome }
  | { id: number; kind: 'failed'; reason: string };

export interface RunOptions {
  /** Parallel workers; 1 runs in this thread. */
  jobs: number;
  /** The bundled script to start workers from; null runs in this thread whatever `jobs` says. */
  workerScript: string | null;
  /** Progress of one task: frames done of its total. */
  onProgress?: (index: number, done: number, total: number) => void;
  /** Called as each task settles, in the order they finish. */
  onSettled?: (index: number, settled: Settled) => void;
}

async function settle(task: AnalyzeTask, progress?: (d: number, t: number) => void): Promise<Settled> {
  try {
    return { ok: true, value: await analyzeFile(task, progress) };
  } catch (err) {
    return { ok: false, file: task.file, reason: reasonOf(err, task.file) };
  }
}

/** Runs every task, in parallel when asked and possible; never rejects for a failed file. */
export async function runTasks(tasks: readonly AnalyzeTask[], options: RunOptions): Promise<Settled[]> {
  const jobs = Math.max(1, Math.min(options.jobs, tasks.length));
  const results: Settled[] = new Array<Settled>(tasks.length);
  if (jobs === 1 || options.workerScript === null) {
    for (let i = 0; i < tasks.length; i++) {
      results[i] = await settle(tasks[i], (d, t) => options.onProgress?.(i, d, t));
      options.onSettled?.(i, results[i]);
    }
    return results;
  }
  const script = options.workerScript;
  let next = 0;
  const lanes: Promise<void>[] = [];
  for (let w = 0; w < jobs; w++) {
    lanes.push(
      (async () => {
        let worker: Worker | null = null;
        try {
          while (next < tasks.length) {
            const i = next++;
            worker ??= startWorker(script);
            const settled = await runOnWorker(worker, i, tasks[i], options);
            // A worker that died is replaced for the next task.
            if (settled.dead) worker = null;
            results[i] = settled.result;
            options.onSettled?.(i, settled.result);
          }
        } finally {
          if (worker !== null) await worker.terminate();
        }
      })(),
    );
  }
  await Promise.all(lanes);
  return results;
}

function startWorker(script: string): Worker {
  const worker = new Worker(script, { workerData: { mark: WORKER_MARK } });
  // An error between tasks must not become an uncaught exception; during a task runOnWorker hears it.
  worker.on('error', () => undefined);
  return worker;
}

function runOnWorker(
  worker: Worker,
  id: number,
  task: AnalyzeTask,
  options: RunOptions,
): Promise<{ result: Settled; dead: boolean }> {
  return new Promise((resolve) => {
    const cleanup = () => {
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
    };
    const onMessage = (m: FromWorker) => {
      if (m.id !== id) return;
      if (m.kind === 'progress') {
        options.onProgress?.(id, m.done, m.total);
        return;
      }
      cleanup();
      resolve({
        result:
          m.kind === 'done' ? { ok: true, value: m.value } : { ok: false, file: task.file, reason: m.reason },
        dead: false,
      });
    };
    const onError = (err: Error) => {
      cleanup();
      resolve({
        result: { ok: false, file: task.file, reason: `analysis worker failed: ${err.message}` },
        dead: true,
      });
    };
    const onExit = (code: number) => {
      cleanup();
      resolve({
        result: { ok: false, file: task.file, reason: `analysis worker stopped (exit code ${code})` },
        dead: true,
      });
    };
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    const message: ToWorker = { id, task };
    worker.postMessage(message);
  });
}

/** The worker's side: serves tasks until the pool terminates it. Progress goes out at most 10 times a second. */
export function serveTasks(port: {
  on(event: 'message', listener: (m: ToWorker) => void): void;
  postMessage(m: FromWorker): void;
}): void {
  port.on('message', (m) => {
    let last = 0;
    const progress = (done: number, total: number) => {
      const now = performance.now();
      if (now - last < 100) return;
      last = now;
      port.postMessage({ id: m.id, kind: 'progress', done, total });
    };
    void settle(m.task, progress).then((s) =>
      port.postMessage(
        s.ok ? { id: m.id, kind: 'done', value: s.value } : { id: m.id, kind: 'failed', reason: s.reason },
      ),
    );
  });
}
