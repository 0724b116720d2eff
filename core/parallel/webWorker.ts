/** Web Worker adapter (renderer): a pool worker from a module worker URL, and the worker-side port. */
import type { PoolWorker, WorkerFactory, WorkerPort } from './protocol.ts';

export function webWorkerFactory(url: URL): WorkerFactory {
  return (): PoolWorker => {
    const worker = new Worker(url, { type: 'module' });
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
