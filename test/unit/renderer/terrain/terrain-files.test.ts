import { describe, expect, it } from 'vitest';
import { MAX_TERRAIN_BYTES, TERRAIN_EXTENSIONS } from '../../../../electron/bridge-api.ts';
import { MAX_TERRAIN_FILE_BYTES, TERRAIN_FILE_EXTENSIONS } from '../../../../renderer/terrain/terrain-files.ts';

describe('elevation-model file rules', () => {
  it('are the same in the browser fallback and in the main process', () => {
    expect([...TERRAIN_FILE_EXTENSIONS]).toEqual([...TERRAIN_EXTENSIONS]);
    expect(MAX_TERRAIN_FILE_BYTES).toBe(MAX_TERRAIN_BYTES);
  });
});
