/**
 * The few declarations we use from two packages that ship no types of their own: pako (a port of zlib:
 * inflate, and deflate for the demo DEM's writer) and lerc (Esri's LERC decoder, pure JavaScript). Both are also what the `geotiff` package
 * itself uses for Deflate and LERC.
 */
declare module 'pako' {
  export class Inflate {
    constructor(options?: { windowBits?: number; chunkSize?: number; raw?: boolean });
    push(data: Uint8Array, flushMode?: boolean | number): boolean;
    onData(chunk: Uint8Array): void;
    onEnd(status: number): void;
    err: number;
    msg: string;
    ended: boolean;
  }
  export function deflate(data: Uint8Array, options?: { level?: number }): Uint8Array;
}

declare module 'lerc' {
  interface LercBlock {
    width: number;
    height: number;
    pixels: ArrayLike<number>[];
    mask: Uint8Array | null;
    dimCount?: number;
  }
  const Lerc: { decode(input: ArrayBuffer, options?: { inputOffset?: number; returnPixelInterleavedDims?: boolean }): LercBlock };
  export default Lerc;
}
