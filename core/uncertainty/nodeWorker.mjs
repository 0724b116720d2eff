// worker_threads bootstrap: Node 20 cannot start a .ts worker, so register tsx, then load the entry.
import { register } from 'tsx/esm/api';

register();
await import('./nodeWorkerEntry.ts');
