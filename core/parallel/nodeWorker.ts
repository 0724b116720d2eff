/**
 * worker_threads adapter (command line). Node 20 cannot start a .ts worker directly, so the worker file may
 * be a small .mjs bootstrap that registers tsx and imports the TypeScript entry (see footprint/nodeWorker.mjs).
 */
import { parentPort, Worker } from 'node:worker_threads';
import type { PoolWorker, WorkerFactory, WorkerPort } from './protocol.ts';

export function nodeWorkerFactory(file: URL, workerData?: unknown): WorkerFactory {
  return (): PoolWorker => {
    const worker = new Worker(file, { workerData });
    // Do not keep the process alive for idle workers; the pool closes them explicitly.
    worker.unref();
    let errorHandler: ((e: Error) => void) | null = null;
    worker.on('error', (e) => errorHandler?.(e));
    worker.on('exit', (code) => {
      if (code !== 0 && code !== 1) errorHandler?.(new Error(`worker exited with code ${code}`));
    });
    return {
      post: (message, transfer = []) => worker.postMessage(message, transfer as never),
      onMessage: (handler) => {
        worker.removeAllListeners('message');
        worker.on('message', handler);
      },
      onError: (handler) => {
        errorHandler = handler;
      },
      terminate: () => {
        errorHandler = null;
        void worker.terminate();
      },
    };
  };
}

/** The port of the worker thread this code runs in. */
export function nodeWorkerPort(): WorkerPort {
  if (!parentPort) throw new Error('nodeWorkerPort() must be called inside a worker thread');
  const port = parentPort;
  return {
    post: (message, transfer = []) => port.postMessage(message, transfer as never),
    onMessage: (handler) => {
      port.on('message', handler);
    },
  };
}
