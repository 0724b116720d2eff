/**
 * Where a GeoTIFF's bytes come from: a byte range at a time, so a reader decodes only the directories and
 * the blocks it needs and a 20k × 20k file is never held whole. The in-memory source serves the app (its
 * DEM bytes arrive whole through the bridge); the CLI passes a file-handle source (core/cli/dem.ts).
 */

export interface ByteSource {
  /** Size of the whole file, bytes. */
  readonly byteLength: number;
  /**
   * Bytes [offset, offset + length), cut at the end of the file (fewer bytes, never an error, past it).
   * The result may be a view into memory the source owns: read it, never write into it.
   */
  read(offset: number, length: number): Promise<Uint8Array>;
}

/** A source over bytes already in memory (views, no copies). */
export function memoryByteSource(bytes: Uint8Array): ByteSource {
  return {
    byteLength: bytes.byteLength,
    read: async (offset, length) => bytes.subarray(Math.min(offset, bytes.byteLength), Math.min(offset + length, bytes.byteLength)),
  };
}

/** True for a ByteSource rather than bytes. */
export function isByteSource(x: unknown): x is ByteSource {
  return typeof x === 'object' && x !== null && typeof (x as ByteSource).read === 'function' && typeof (x as ByteSource).byteLength === 'number';
}

/**
 * The `geotiff` package's source interface (BaseSource: fetch of slices, each an ArrayBuffer starting at
 * its slice's offset), served by a ByteSource; the package parses directories and GeoKeys through it.
 */
export function geotiffSourceOf(src: ByteSource) {
  const fetchSlice = async (slice: { offset: number; length: number }) => {
    const u = await src.read(slice.offset, slice.length);
    const data = u.byteOffset === 0 && u.byteLength === u.buffer.byteLength && u.buffer instanceof ArrayBuffer ? u.buffer : u.slice().buffer;
    return { data, offset: slice.offset, length: slice.length };
  };
  return {
    fetchSlice,
    fetch: async (slices: { offset: number; length: number }[]) => Promise.all(slices.map(async (s) => (await fetchSlice(s)).data)),
    get fileSize() {
      return src.byteLength;
    },
    close: async () => undefined,
  };
}
