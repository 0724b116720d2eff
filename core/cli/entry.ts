/**
 * The command line as a process: runs `main` on the process's arguments and sets the exit code. The compiled
 * command line (bin/build-cli.mjs) is built from this file; bin/landreach.mjs loads it, or this file through tsx.
 */
import { main } from './main.ts';

process.exitCode = await main(process.argv.slice(2));
