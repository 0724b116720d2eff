/**
 * Regenerates the shipped demo DEMs (an INVENTED site) from their generator: `npm run gen:terrain`.
 * Writes demo-site.tif (20 km × 20 km at 10 m), demo-inset.tif (2 km × 2 km at 2 m around the nominal
 * target) — Float32 GeoTIFFs, Deflate, on an equirectangular projection of a Mars-sized sphere — and
 * demo-site.json (what they are, how they were made, the features placed, each file's size and SHA-256).
 */
import { createHash } from 'node:crypto';
import { writeFileSync, renameSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { DEMO_SITE_CRS, DEMO_SITE_FILES, DEMO_SITE_NAME, DEMO_TERRAIN_DEFAULTS, demoSiteFeatures, demoSiteFileBytes } from '../../../core/terrain/index.ts';

const dir = fileURLToPath(new URL('.', import.meta.url));
const features = demoSiteFeatures();
const files: [string, Uint8Array | string][] = [];
const written: Record<string, unknown>[] = [];
for (const entry of DEMO_SITE_FILES) {
  const bytes = demoSiteFileBytes(features, entry);
  files.push([entry.file, bytes]);
  written.push({
    file: entry.file,
    role: entry.role,
    ...entry.raster,
    bytes: bytes.length,
    sha256: createHash('sha256').update(bytes).digest('hex'),
  });
}
const meta = {
  name: DEMO_SITE_NAME,
  invented: true,
  note: 'Invented terrain for demonstrations and tests; not a real place. Preliminary design and trade studies only; not flight software.',
  generator: 'core/terrain/demo-terrain.ts (npm run gen:terrain)',
  options: DEMO_TERRAIN_DEFAULTS,
  crs: { ...DEMO_SITE_CRS },
  frame: 'raster windows in site metres: east, north of the site centre (the demo study nominal target), which is at (centreEasting_m, centreNorthing_m) of the CRS',
  rasters: written,
  features: {
    craters: features.craters.length,
    largestCrater: features.craters.reduce((a, b) => (b.diameter_m > a.diameter_m ? b : a)),
    escarpment: features.escarpment,
    ridges: features.ridges,
    knobFields: features.knobFields,
    boulderFields: features.boulderFields,
  },
};
files.push(['demo-site.json', JSON.stringify(meta, null, 2) + '\n']);
// Write beside, then rename: a failed run never leaves a half-written asset.
for (const [name, data] of files) {
  writeFileSync(dir + name + '.tmp', data);
  renameSync(dir + name + '.tmp', dir + name);
}
process.stdout.write(written.map((w) => `wrote ${dir}${String(w.file)} (${String(w.bytes)} bytes)\n`).join('') + `wrote ${dir}demo-site.json\n`);
