/** core/terrain: elevation grids in, slope / hazard / safe-site products out. Pure; no node:*. */
export * from './grid.ts';
export * from './geotiff-reader.ts';
export * from './georeference.ts';
export * from './projection.ts';
export * from './png-reader.ts';
export * from './json-grid.ts';
export * from './tiff-writer.ts';
export * from './slope.ts';
export * from './footprint-fit.ts';
export * from './distance.ts';
export * from './hazard.ts';
export * from './sites.ts';
export * from './resample.ts';
export * from './mesh.ts';
export * from './demo-terrain.ts';
export * from './lzw.ts';
export { MAX_BLOCK_BYTES, MAX_DECODED_BYTES } from './tiff-blocks.ts';
export * from './groundFrame.ts';
