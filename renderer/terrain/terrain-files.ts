/**
 * What an elevation-model file may be, as the browser fallback checks it. The renderer may import electron/
 * for types only, so these repeat electron/bridge-api.ts TERRAIN_EXTENSIONS and MAX_TERRAIN_BYTES (the main
 * process's limits); test/unit/renderer/terrain/terrain-files.test.ts checks the two agree.
 */
export const TERRAIN_FILE_EXTENSIONS = ['tif', 'tiff', 'png', 'json'] as const;
export const MAX_TERRAIN_FILE_BYTES = 256 * 1024 * 1024;
