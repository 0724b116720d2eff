/**
 * A pool of workers fed from a pull-based job source: the next job is asked for only when a worker is
 * free, so a job may depend on results that arrived meanwhile (the footprint uses this for continuation).
 * Results are delivered as they arrive; cancelling stops the dispatch, ends the workers, and keeps every
 * result already delivered.
 */
import type { JobMessage, PoolWorker, WorkerFactory, WorkerReply } from './protocol.ts';

export interface PoolRunOptions<Job, Result> {
  /** The next job, or null when there is none for now (`done` says whether more may come later). */
  next(): { job: Job; transfer?: Transferable[] } | null;
  /** True when no job will ever come again (the run ends when also nothing is in flight). */
  done(): boolean;
  onResult(result: Result, job: Job): void;
  signal?: AbortSignal;
}

export interface PoolRunSummary {
  completed: number;
  cancelled: boolean;
}

export class JobPool<Job, Result> {
  private readonly workers: PoolWorker[] = [];
  private closed = false;

  constructor(
    private readonly factory: WorkerFactory,
    readonly size: number,
  ) {
    if (!Number.isInteger(size) || size < 1 || size > 64) {
      throw new RangeError(`workers: ${size} (must be a whole number from 1 to 64)`);
    }
  }

  private ensureWorkers(): void {
    while (this.workers.length < this.size) this.workers.push(this.factory());
  }

  run(options: PoolRunOptions<Job, Result>): Promise<PoolRunSummary> {
    if (this.closed) return Promise.reject(new Error('the job pool is closed'));
    this.ensureWorkers();
    return new Promise<PoolRunSummary>((resolve, reject) => {
      let nextId = 1;
      let completed = 0;
      let finished = false;
      const inFlight = new Map<number, { job: Job; worker: PoolWorker }>();
      const idle = new Set<PoolWorker>(this.workers);

      const finish = (outcome: PoolRunSummary | Error) => {
        if (finished) return;
        finished = true;
        options.signal?.removeEventListener('abort', onAbort);
        if (outcome instanceof Error) reject(outcome);
        else resolve(outcome);
      };
      const onAbort = () => {
        // Workers busy with an unfinished job are ended and replaced; their jobs are dropped.
        for (const { worker } of inFlight.values()) this.replace(worker);
        inFlight.clear();
        finish({ completed, cancelled: true });
      };
      const pump = () => {
        if (finished) return;
        if (options.signal?.aborted) return onAbort();
        for (const worker of [...idle]) {
          const item = options.next();
          if (!item) break;
          const id = nextId++;
          idle.delete(worker);
          inFlight.set(id, { job: item.job, worker });
          worker.post({ type: 'job', id, job: item.job } satisfies JobMessage<Job>, item.transfer);
        }
        if (inFlight.size === 0 && options.done()) finish({ completed, cancelled: false });
        else if (inFlight.size === 0 && idle.size > 0 && !options.done()) {
          finish(new Error('job source stalled: no job available, none running, and not done'));
        }
      };
      for (const worker of this.workers) {
        worker.onMessage((message) => {
          if (finished) return;
          const reply = message as WorkerReply<Result>;
          const entry = inFlight.get(reply.id);
          if (!entry) return;
          inFlight.delete(reply.id);
          idle.add(worker);
          if (reply.type === 'error') {
            for (const { worker: w } of inFlight.values()) this.replace(w);
            finish(new Error(`worker job failed: ${reply.message}`));
            return;
          }
          completed++;
          try {
            options.onResult(reply.result, entry.job);
          } catch (err) {
            finish(err instanceof Error ? err : new Error(String(err)));
            return;
          }
          pump();
        });
        worker.onError((err) => finish(new Error(`worker crashed: ${err.message}`)));
      }
      options.signal?.addEventListener('abort', onAbort);
      pump();
    });
  }

  private replace(worker: PoolWorker): void {
    const k = this.workers.indexOf(worker);
    worker.terminate();
    if (k >= 0) this.workers.splice(k, 1);
  }

  /** Ends every worker; the pool cannot run again. */
  close(): void {
    this.closed = true;
    for (const w of this.workers) w.terminate();
    this.workers.length = 0;
  }
}

/**
 * A "worker" that runs the handler on the calling thread (after a macrotask, so the caller's event loop
 * keeps turning): the same pool code serves tests, single-core runs, and environments without workers.
 */
export function inlineWorkerFactory<Job, Result>(
  handle: (job: Job) => Result,
): WorkerFactory {
  return () => {
    let handler: ((m: unknown) => void) | null = null;
    let alive = true;
    return {
      post(message) {
        const m = message as JobMessage<Job>;
        setTimeout(() => {
          if (!alive || !handler) return;
          try {
            handler({ type: 'result', id: m.id, result: handle(m.job) } satisfies WorkerReply<Result>);
          } catch (err) {
            handler({ type: 'error', id: m.id, message: err instanceof Error ? err.message : String(err) } satisfies WorkerReply<Result>);
          }
        }, 0);
      },
      onMessage(h) {
        handler = h;
      },
      onError() {},
      terminate() {
        alive = false;
      },
    };
  };
}
