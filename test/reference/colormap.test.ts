import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { VIRIDIS } from '../../core/study/colormap.ts';
import { REFERENCE_PYTHON, referenceToolsReady } from '../support/reference-tools.ts';

// Reference: matplotlib's viridis table (van der Walt & Smith 2015) from Debian's python3-matplotlib,
// a general-purpose library outside the project. Our table must match it entry for entry.
describe.runIf(referenceToolsReady('matplotlib'))('viridis table against matplotlib', () => {
  it('matches every one of the 256 entries to 1e-6', () => {
    const script = 'import json; from matplotlib import cm; print(json.dumps([list(map(float, cm.viridis(i / 255)[:3])) for i in range(256)]))';
    const reference = JSON.parse(execFileSync(REFERENCE_PYTHON, ['-c', script], { encoding: 'utf8', env: { ...process.env, MPLBACKEND: 'Agg' } })) as number[][];
    expect(reference).toHaveLength(VIRIDIS.size);
    reference.forEach((rgb, i) => {
      // Float32 storage: ~6e-8 relative, well inside the 1e-6 of the six-decimal table.
      for (let k = 0; k < 3; k++) expect(Math.abs(VIRIDIS.srgb[3 * i + k] - rgb[k]), `entry ${i}`).toBeLessThan(1e-6);
    });
  });
});
