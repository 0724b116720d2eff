/** Compiles core/linalg/wasm/assembly/kernels.ts; returns the WebAssembly module bytes. */
export function compileKernels(): Promise<Uint8Array>;
/** The text of core/linalg/wasm/kernels.generated.ts for the given bytes. */
export function generatedModule(binary: Uint8Array): string;
