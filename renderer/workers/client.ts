// The page's side of the compute worker. When the worker cannot start (no bundle yet,
// or no Worker at all) the same handlers run in the page, with a note on the console.
import { handleCompute } from './handlers';
import type { ComputeRequest, ComputeResults, FromCompute, ToCompute } from './protocol';

export const COMPUTE_WORKER_URL = 'compute-worker.js';

type Pending = { request: ComputeRequest; resolve(v: unknown): void; reject(e: Error): void };

export class ComputeClient {
  private worker: Worker | null = null;
  private answered = false;
  private nextId = 1;
  private readonly pending = new Map<number, Pending>();

  constructor(url = COMPUTE_WORKER_URL) {
    try {
      const w = new Worker(url);
      w.onmessage = (e: MessageEvent<FromCompute>) => this.receive(e.data);
      // A missing bundle shows as an error before any reply: fall back and replay.
      w.onerror = (e) => {
        e.preventDefault();
        if (!this.answered) this.fallBack(`compute worker unavailable (${e.message || url})`);
      };
      this.worker = w;
    } catch (err) {
      this.fallBack(`compute worker unavailable (${err instanceof Error ? err.message : String(err)})`);
    }
  }

  /** Whether requests run in a worker (false: in the page). */
  get inWorker(): boolean {
    return this.worker !== null;
  }

  run<K extends ComputeRequest['kind']>(
    request: Extract<ComputeRequest, { kind: K }>,
  ): Promise<ComputeResults[K]> {
    const id = this.nextId++;
    return new Promise<ComputeResults[K]>((resolve, reject) => {
      this.pending.set(id, { request, resolve: resolve as (v: unknown) => void, reject });
      if (this.worker) this.worker.postMessage({ ...request, id } satisfies ToCompute);
      else setTimeout(() => this.runHere(id), 0);
    });
  }

  destroy(): void {
    this.worker?.terminate();
    this.worker = null;
    for (const p of this.pending.values()) p.reject(new Error('compute client closed'));
    this.pending.clear();
  }

  private receive(m: FromCompute): void {
    this.answered = true;
    const p = this.pending.get(m.id);
    if (!p) return;
    this.pending.delete(m.id);
    if (m.ok) p.resolve(m.result);
    else p.reject(new Error(m.message));
  }

  private fallBack(why: string): void {
    console.info(`${why}: computing in the page`);
    this.worker?.terminate();
    this.worker = null;
    for (const id of this.pending.keys()) setTimeout(() => this.runHere(id), 0);
  }

  private runHere(id: number): void {
    const p = this.pending.get(id);
    if (!p) return;
    this.pending.delete(id);
    try {
      p.resolve(handleCompute(p.request));
    } catch (err) {
      p.reject(err instanceof Error ? err : new Error(String(err)));
    }
  }
}
