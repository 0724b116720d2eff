/**
 * A small editor for the first image directory of a TIFF or BigTIFF (TIFF 6.0 Section 2; BigTIFF): lists
 * its entries and rewrites values in place, so tests can damage GDAL-written files in named ways (a byte
 * count set to 0, a predictor of 99, RowsPerStrip stored as a DOUBLE…).
 */
export const TYPE_BYTES: Record<number, number> = { 1: 1, 2: 1, 3: 2, 4: 4, 5: 8, 6: 1, 7: 1, 8: 2, 9: 4, 10: 8, 11: 4, 12: 8, 13: 4, 16: 8, 17: 8, 18: 8 };

export const TAG = {
  ImageWidth: 256, ImageLength: 257, BitsPerSample: 258, Compression: 259, StripOffsets: 273, SamplesPerPixel: 277,
  RowsPerStrip: 278, StripByteCounts: 279, PlanarConfiguration: 284, Predictor: 317, TileWidth: 322, TileLength: 323,
  TileOffsets: 324, TileByteCounts: 325, SampleFormat: 339, ModelPixelScale: 33550, ModelTiepoint: 33922, GdalNoData: 42113,
} as const;

export interface Entry {
  tag: number;
  type: number;
  count: number;
  /** Byte position of the entry in the file. */
  at: number;
  /** Byte position of the first value (inside the entry when it fits, else where the entry points). */
  dataAt: number;
}

export class TiffEditor {
  readonly le: boolean;
  readonly big: boolean;
  readonly view: DataView;
  readonly entries: Entry[] = [];

  constructor(readonly bytes: Uint8Array) {
    this.view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    this.le = bytes[0] === 0x49;
    this.big = this.view.getUint16(2, this.le) === 43;
    const ifd = this.big ? Number(this.view.getBigUint64(8, this.le)) : this.view.getUint32(4, this.le);
    const n = this.big ? Number(this.view.getBigUint64(ifd, this.le)) : this.view.getUint16(ifd, this.le);
    for (let i = 0; i < n; i++) {
      const at = ifd + (this.big ? 8 : 2) + i * (this.big ? 20 : 12);
      const tag = this.view.getUint16(at, this.le);
      const type = this.view.getUint16(at + 2, this.le);
      const count = this.big ? Number(this.view.getBigUint64(at + 4, this.le)) : this.view.getUint32(at + 4, this.le);
      const valueAt = at + (this.big ? 12 : 8);
      const inline = count * (TYPE_BYTES[type] ?? 1) <= (this.big ? 8 : 4);
      const dataAt = inline ? valueAt : this.big ? Number(this.view.getBigUint64(valueAt, this.le)) : this.view.getUint32(valueAt, this.le);
      this.entries.push({ tag, type, count, at, dataAt });
    }
  }

  entry(tag: number): Entry | undefined {
    return this.entries.find((e) => e.tag === tag);
  }

  get(tag: number, index = 0): number {
    const e = this.entry(tag);
    if (!e) throw new Error(`no tag ${tag}`);
    const p = e.dataAt + index * TYPE_BYTES[e.type];
    switch (e.type) {
      case 3: return this.view.getUint16(p, this.le);
      case 4: return this.view.getUint32(p, this.le);
      case 16: return Number(this.view.getBigUint64(p, this.le));
      case 12: return this.view.getFloat64(p, this.le);
      default: return this.bytes[p];
    }
  }

  /** Writes value `index` of `tag` in the entry's own type (integers wrap to the type's width). */
  set(tag: number, index: number, value: number): void {
    const e = this.entry(tag);
    if (!e) throw new Error(`no tag ${tag}`);
    const p = e.dataAt + index * TYPE_BYTES[e.type];
    switch (e.type) {
      case 3: this.view.setUint16(p, value & 0xffff, this.le); break;
      case 4: this.view.setUint32(p, value >>> 0, this.le); break;
      case 16: this.view.setBigUint64(p, BigInt.asUintN(64, BigInt(Math.trunc(value))), this.le); break;
      case 12: this.view.setFloat64(p, value, this.le); break;
      default: this.bytes[p] = value & 0xff;
    }
  }

  /** Byte ranges of the strips or tiles, in index order. */
  blocks(): { offset: number; count: number }[] {
    const offsets = this.entry(TAG.StripOffsets) ?? this.entry(TAG.TileOffsets)!;
    const counts = this.entry(TAG.StripByteCounts) ?? this.entry(TAG.TileByteCounts)!;
    return Array.from({ length: offsets.count }, (_, i) => ({ offset: this.get(offsets.tag, i), count: this.get(counts.tag, i) }));
  }
}

/** A copy of `bytes` with `extra` appended; returns the copy and where the extra bytes start. */
export function append(bytes: Uint8Array, extra: Uint8Array): { bytes: Uint8Array; at: number } {
  const out = new Uint8Array(bytes.length + extra.length);
  out.set(bytes);
  out.set(extra, bytes.length);
  return { bytes: out, at: bytes.length };
}

/**
 * Retypes a classic-TIFF entry holding one value as a DOUBLE stored at the end of the file (e.g.
 * RowsPerStrip = 1e-300, a value no integer type can hold). Returns the new file.
 */
export function retypeAsDouble(bytes: Uint8Array, tag: number, value: number): Uint8Array {
  const ed = new TiffEditor(bytes);
  if (ed.big) throw new Error('classic TIFF only');
  const e = ed.entry(tag);
  if (!e) throw new Error(`no tag ${tag}`);
  const d = new Uint8Array(8);
  new DataView(d.buffer).setFloat64(0, value, ed.le);
  const { bytes: out, at } = append(bytes, d);
  const v = new DataView(out.buffer);
  v.setUint16(e.at + 2, 12, ed.le);
  v.setUint32(e.at + 4, 1, ed.le);
  v.setUint32(e.at + 8, at, ed.le);
  return out;
}
