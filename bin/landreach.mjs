#!/usr/bin/env node
// Command-line entry. Runs the TypeScript sources through tsx so a fresh `npm ci` is enough.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../core/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
