/** The WebAssembly modules: `kernels` (sparse LDLᵀ) and `iteration` (the interior-point iteration with them). */
export type KernelModuleName = 'kernels' | 'iteration';
export const MODULES: Record<KernelModuleName, { sources: string[]; output: string; constant: string }>;
/** Compiles one module (default `kernels`); returns the WebAssembly module bytes. */
export function compileKernels(name?: KernelModuleName): Promise<Uint8Array>;
/** The text of the module's generated TypeScript file for the given bytes. */
export function generatedModule(binary: Uint8Array, name?: KernelModuleName): string;
