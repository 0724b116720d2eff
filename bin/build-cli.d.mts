/** The bundles: source entry (from the project root) → output file (inside the output folder). */
export const CLI_BUNDLES: readonly { entry: string; output: string }[];
/** What a build was made from: the time it started and the project's own sources (paths from the root). */
export interface CliBuildInfo {
  builtAt_ms: number;
  bundles: readonly { entry: string; output: string }[];
  inputs: string[];
}
/** Builds the command line into `outdir` (absolute, or relative to the project root; default dist-cli). */
export function buildCli(outdir?: string): Promise<CliBuildInfo>;
