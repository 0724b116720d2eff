/**
 * Imported first by main.ts, before anything that builds a zod schema: zod's fast path compiles parsers
 * with `new Function`, and even its feature probe is reported as a violation by the page's CSP (no
 * 'unsafe-eval'). Jitless parsing is plenty fast for study files.
 */
import { config } from 'zod';

config({ jitless: true });
