import type { CliCommand, CliIo } from './command.ts';
import { UsageError } from './command.ts';
import { COMMANDS } from './commands/index.ts';
import { APP_VERSION, CAUTION } from '../study/provenance.ts';


async function helpText(): Promise<string> {
  const commands = await Promise.all(COMMANDS.map((c) => c.load()));
  const width = Math.max(...commands.map((c) => c.name.length));
  return [
    'landreach — powered-descent divert budgeting from the command line',
    '',
    'Usage: landreach COMMAND [options]   (landreach COMMAND --help for details; landreach --version)',
    '',
    'Commands:',
    ...commands.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`),
    '',
    CAUTION,
    '',
  ].join('\n');
}

export function defaultIo(): CliIo {
  return {
    stdout: (t) => process.stdout.write(t),
    stderr: (t) => process.stderr.write(t),
    interactive: Boolean(process.stderr.isTTY),
  };
}

/** Dispatches to a sub-command; returns the exit code (0 ok, 1 computation failed, 2 bad usage or input). */
export async function main(argv: string[], io: CliIo = defaultIo()): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    io.stdout(await helpText());
    return name ? 0 : 2;
  }
  if (name === '--version' || name === '-V') {
    io.stdout(`landreach ${APP_VERSION}\n`);
    return 0;
  }
  const entry = COMMANDS.find((c) => c.name === name);
  if (!entry) {
    io.stderr(`landreach: unknown command '${name}'. Known commands: ${COMMANDS.map((c) => c.name).join(', ')}.\n`);
    return 2;
  }
  const command: CliCommand = await entry.load();
  if (rest.includes('--help') || rest.includes('-h')) {
    io.stdout(command.usage + '\n');
    return 0;
  }
  try {
    return await command.run(rest, io);
  } catch (err) {
    if (err instanceof UsageError) {
      io.stderr(`landreach ${name}: ${err.message}\n`);
      return 2;
    }
    // A computation that failed: say so plainly (the stack only on request), exit 1; nothing was written.
    const e = err instanceof Error ? err : new Error(String(err));
    io.stderr(`landreach ${name}: the computation failed: ${e.message}\n`);
    if (process.env.LANDREACH_DEBUG) io.stderr(`${e.stack ?? ''}\n`);
    return 1;
  }
}
