/**
 * A job pool whose "workers" run on the calling thread and finish their jobs in an order the test chooses,
 * not in the order they were sent: with several jobs in flight, the scheduler picks which one completes
 * next (last sent first, or a seeded shuffle). Each worker keeps its own handler (its own evaluator and
 * solver state), as a real worker thread does. No clock is involved: the order is fixed by the policy.
 */
import type { JobMessage, PoolWorker, WorkerFactory, WorkerReply } from '../../core/parallel/protocol.ts';
import { Rng } from './random.ts';

export type CompletionPolicy = 'first-sent-first' | 'last-sent-first' | { shuffleSeed: number };

export function scheduledWorkerFactory<Job, Result>(makeHandler: () => (job: Job) => Result, policy: CompletionPolicy): WorkerFactory {
  const queue: { run: () => void }[] = [];
  const rng = typeof policy === 'object' ? new Rng(policy.shuffleSeed) : null;
  let scheduled = false;
  const releaseOne = () => {
    scheduled = false;
    if (queue.length === 0) return;
    const k = policy === 'first-sent-first' ? 0 : policy === 'last-sent-first' ? queue.length - 1 : rng!.int(0, queue.length - 1);
    const [item] = queue.splice(k, 1);
    item.run();
    schedule();
  };
  // setImmediate runs after the pool has handled the last reply (and sent any job it made possible).
  const schedule = () => {
    if (!scheduled && queue.length > 0) {
      scheduled = true;
      setImmediate(releaseOne);
    }
  };
  return (): PoolWorker => {
    const handle = makeHandler();
    let onReply: ((m: unknown) => void) | null = null;
    let alive = true;
    return {
      post(message) {
        const m = message as JobMessage<Job>;
        queue.push({
          run: () => {
            if (!alive || !onReply) return;
            try {
              onReply({ type: 'result', id: m.id, result: handle(m.job) } satisfies WorkerReply<Result>);
            } catch (err) {
              onReply({ type: 'error', id: m.id, message: err instanceof Error ? err.message : String(err) } satisfies WorkerReply<Result>);
            }
          },
        });
        schedule();
      },
      onMessage(h) {
        onReply = h;
      },
      onError() {},
      terminate() {
        alive = false;
      },
    };
  };
}
