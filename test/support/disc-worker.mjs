// worker_threads bootstrap for tests: Node 20 cannot run .ts workers directly, so register tsx first.
import { register } from 'tsx/esm/api';

register();
await import('./disc-worker-entry.ts');
