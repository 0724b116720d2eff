/**
 * The app's Web Workers. Each `new Worker(new URL(…, import.meta.url))` is written out literally so Vite
 * bundles the worker entry (worker: { format: 'es' }); the CSP allows workers from 'self'.
 */
import type { PoolWorker, WorkerFactory } from '../../core/parallel/protocol.ts';

function adapt(worker: Worker): PoolWorker {
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

export const footprintWorkerFactory: WorkerFactory = () =>
  adapt(new Worker(new URL('../workers/footprint.worker.ts', import.meta.url), { type: 'module' }));

export const trajectoryWorkerFactory: WorkerFactory = () =>
  adapt(new Worker(new URL('../workers/trajectory.worker.ts', import.meta.url), { type: 'module' }));
