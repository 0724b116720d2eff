import type { CliCommand } from '../command.ts';

/**
 * A sub-command, loaded only when it runs: each command brings its own dependencies (the terrain readers and
 * projections, the worker pool, the studies), so `landreach trajectory` or `landreach --version` loads none
 * of the others' — the compiled command line (bin/build-cli.mjs) splits them into chunks along these imports.
 */
export interface CommandEntry {
  /** The word after `landreach` (equal to the loaded command's `name`; a unit test checks it). */
  readonly name: string;
  load(): Promise<CliCommand>;
}

/** Every sub-command, in the order `landreach --help` lists them. Add new commands here. */
export const COMMANDS: readonly CommandEntry[] = [
  { name: 'trajectory', load: async () => (await import('./trajectory.ts')).trajectoryCommand },
  { name: 'footprint', load: async () => (await import('./footprint.ts')).footprintCommand },
  { name: 'study', load: async () => (await import('./study.ts')).studyCommand },
  { name: 'hazard', load: async () => (await import('./hazard.ts')).hazardCommand },
  { name: 'verify', load: async () => (await import('./verify.ts')).verifyCommand },
];
