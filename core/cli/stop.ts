/**
 * Stopping a long command by a signal without losing finished work. From `install()` until `dispose()`,
 * Ctrl-C (SIGINT), SIGTERM and SIGHUP no longer end the process: the first one aborts `signal` (the
 * footprint stops dispatching rows; finished rows are kept) and the command then writes what finished,
 * marked as stopped early; every later one only says that the files are being written. The process ends
 * by itself once they are, with exit code 128 + the signal's number (130 for Ctrl-C, 143 for SIGTERM,
 * 129 for SIGHUP), the shell's convention for "ended by that signal". SIGKILL cannot be caught: what it
 * interrupts is handled by the next run (files.ts, removeOrphanTemporaries and the manifest).
 */
import { constants } from 'node:os';
import type { CliIo } from './command.ts';

const SIGNALS = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const;
type StopSignalName = (typeof SIGNALS)[number];

export class StopRequest {
  private readonly controller = new AbortController();
  private received: StopSignalName | null = null;
  private readonly handlers = new Map<StopSignalName, () => void>();

  constructor(private readonly io: CliIo) {}

  /** Starts catching the signals (keep them caught until the files are written). */
  install(): this {
    for (const name of SIGNALS) {
      const handler = () => this.request(name);
      this.handlers.set(name, handler);
      process.on(name, handler);
    }
    return this;
  }

  dispose(): void {
    for (const [name, handler] of this.handlers) process.removeListener(name, handler);
    this.handlers.clear();
  }

  /** Aborted by the first signal. */
  get signal(): AbortSignal {
    return this.controller.signal;
  }

  get stopped(): boolean {
    return this.received !== null;
  }

  /** The first signal received, if any. */
  get signalName(): StopSignalName | null {
    return this.received;
  }

  /** 128 + the signal's number once stopped (130 for SIGINT, 143 for SIGTERM); null otherwise. */
  get exitCode(): number | null {
    return this.received ? 128 + constants.signals[this.received] : null;
  }

  /** What a signal does (public so that tests and other front ends can stop a run the same way). */
  request(name: StopSignalName): void {
    if (this.received) {
      this.io.stderr(`\n${name}: still writing the results that finished; the files will say the run stopped early\n`);
      return;
    }
    this.received = name;
    this.io.stderr(`\n${name}: stopping; writing the results that finished (marked as stopped early)…\n`);
    this.controller.abort();
  }
}
