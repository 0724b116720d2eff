/** A reference tool's id. */
export type ReferenceToolId = 'cvxopt' | 'numpy' | 'scipy' | 'matplotlib' | 'pillow' | 'gdal-python' | 'gdal' | 'chromium';
export interface ReferenceTool {
  id: ReferenceToolId;
  /** The name shown to people (CVXOPT, GDAL…). */
  label: string;
  /** The Debian 12 package that provides it. */
  debian: string;
}
export interface ToolCheck extends ReferenceTool {
  /** Null when the tool is usable here, else what is wrong. */
  reason: string | null;
}
export type Plan =
  | { action: 'none' }
  | { action: 'install'; packages: string[]; command: string }
  | { action: 'stop'; packages: string[]; message: string };
export const GDAL_PROGRAMS: string[];
export const REFERENCE_TOOLS: ReferenceTool[];
/** Where the tests look for the tools: LANDREACH_PYTHON, LANDREACH_GDAL_BIN, LANDREACH_CHROMIUM, else the Debian locations. */
export function referencePaths(env?: NodeJS.ProcessEnv): { python: string; gdalBin: string | null; chromium: string };
export function findOnPath(name: string, env?: NodeJS.ProcessEnv): string | null;
/** What to spawn for a GDAL program (in LANDREACH_GDAL_BIN when set, else its name, found on PATH). */
export function gdalProgram(name: string, env?: NodeJS.ProcessEnv): string;
export function checkReferenceTools(ids?: readonly ReferenceToolId[], env?: NodeJS.ProcessEnv): ToolCheck[];
export function installCommand(packages: string[], root: boolean): string;
export function plan(missing: ToolCheck[], machine: { root: boolean; aptGet: boolean }): Plan;
export function missingMessage(missing: ToolCheck[], why: string, command: string): string;
/** Checks, installs what is missing where it can, checks again; returns the exit code. */
export function main(env?: NodeJS.ProcessEnv): number;
