/** Web Worker adapter (renderer): the pool side of a module worker, and the worker-side port. */
import type { PoolWorker, WorkerPort } from './protocol.ts';

/**
 * The pool side of a Web Worker. The caller creates the worker itself, writing
 * `new Worker(new URL('…', import.meta.url), { type: 'module' })` out literally so the bundler (Vite)
 * finds and bundles the worker entry.
 */
export function adaptWebWorker(worker: Worker): PoolWorker {
  return {
    post: (message, transfer = []) => worker.postMessage(message, transfer),
    onMessage: (handler) => {
      worker.onmessage = (ev: MessageEvent) => handler(ev.data);
    },
    onError: (handler) => {
      worker.onerror = (ev: ErrorEvent) => handler(new Error(ev.message || 'worker error'));
    },
    terminate: () => worker.terminate(),
  };
}

/** The port of the worker this code runs in (call from inside a Web Worker). */
export function webWorkerPort(): WorkerPort {
  const scope = globalThis as unknown as {
    postMessage(m: unknown, t?: Transferable[]): void;
    onmessage: ((ev: MessageEvent) => void) | null;
  };
  return {
    post: (message, transfer = []) => scope.postMessage(message, transfer),
    onMessage: (handler) => {
      scope.onmessage = (ev) => handler(ev.data);
    },
  };
}
