/** One sub-command of the `landreach` command line. */
export interface CliCommand {
  /** The word after `landreach`. */
  readonly name: string;
  /** One line for `landreach --help`. */
  readonly summary: string;
  /** Full usage text for `landreach NAME --help`. */
  readonly usage: string;
  /** Runs the command; resolves to the process exit code. */
  run(args: string[], io: CliIo): Promise<number>;
}

export interface CliIo {
  stdout(text: string): void;
  stderr(text: string): void;
  /** True when stderr is a terminal (progress bars are drawn only then). */
  readonly interactive: boolean;
}

/** An error the user can fix: printed without a stack trace, exit code 2. */
export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UsageError';
  }
}
