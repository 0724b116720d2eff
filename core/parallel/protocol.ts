/**
 * The message protocol between a job pool and its workers, shared by the Web Worker and worker_threads
 * adapters. A worker receives one job at a time and answers with its result or an error.
 */
export interface JobMessage<Job> {
  type: 'job';
  id: number;
  job: Job;
}

export type WorkerReply<Result> =
  | { type: 'result'; id: number; result: Result }
  | { type: 'error'; id: number; message: string };

/** The worker side of a channel: one postMessage, one message handler. */
export interface WorkerPort {
  post(message: unknown, transfer?: Transferable[]): void;
  onMessage(handler: (message: unknown) => void): void;
}

/** The pool side of one worker. */
export interface PoolWorker {
  post(message: unknown, transfer?: Transferable[]): void;
  onMessage(handler: (message: unknown) => void): void;
  onError(handler: (error: Error) => void): void;
  terminate(): void;
}

export type WorkerFactory = () => PoolWorker;

/** Result of a job handler: the value and the buffers to transfer rather than copy. */
export interface HandledJob<Result> {
  result: Result;
  transfer?: Transferable[];
}

/**
 * Serves jobs on a worker port: each job is passed to `handle`; its result (or the error's message) is
 * posted back. Jobs run one after another, in arrival order.
 */
export function serveJobs<Job, Result>(port: WorkerPort, handle: (job: Job) => HandledJob<Result>): void {
  port.onMessage((message) => {
    const m = message as JobMessage<Job>;
    if (!m || m.type !== 'job') return;
    try {
      const { result, transfer } = handle(m.job);
      port.post({ type: 'result', id: m.id, result } satisfies WorkerReply<Result>, transfer);
    } catch (err) {
      port.post({ type: 'error', id: m.id, message: err instanceof Error ? err.message : String(err) } satisfies WorkerReply<Result>);
    }
  });
}
