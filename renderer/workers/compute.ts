// The compute worker's entry: bundled on its own (no imports left), loaded as a classic
// worker from compute-worker.js beside the page.
import { handleCompute } from './handlers';
import type { FromCompute, ToCompute } from './protocol';

const scope = self as unknown as {
  onmessage: ((e: MessageEvent<ToCompute>) => void) | null;
  postMessage(m: FromCompute): void;
};

scope.onmessage = (e) => {
  const { id, ...request } = e.data;
  try {
    scope.postMessage({ id, ok: true, result: handleCompute(request) });
  } catch (err) {
    scope.postMessage({ id, ok: false, message: err instanceof Error ? err.message : String(err) });
  }
};
