/**
 * The footprint as GeoTIFFs in the DEM's own CRS: the minimum-propellant field (Float32, kg) and the
 * reachable-with-reserve mask (Byte). One pixel per target, its centre on the target: the target grid is
 * regular in local ground metres and the ground frame maps it to the DEM's CRS by one affine map
 * (core/terrain/groundFrame.ts), so the raster's geotransform is exact — north-up when the map is diagonal
 * (e.g. equirectangular), rotated (ModelTransformation) where meridian convergence turns it (e.g. polar
 * stereographic away from the central meridian). No value is resampled. Pure: bytes out.
 */
import type { FootprintField } from '../footprint/field.ts';
import { TARGET } from '../footprint/field.ts';
import type { FootprintPlace } from '../footprint/georeferencedFootprint.ts';
import { rasterCrs, writeGeoTiff, type RasterGeoreference } from '../terrain/tiff-writer.ts';
import { withinBudget } from './footprintExport.ts';
import { CAUTION } from '../study/provenance.ts';

/** Mask values: reachable with the reserve kept, certainly not, and not computed / not established (nodata). */
export const REACHABLE_MASK = { no: 0, yes: 1, noData: 255 } as const;

/**
 * The geotransform of a field's raster in the DEM's CRS. Raster row 0 is the northernmost target row
 * (field row ny − 1); pixel (col, row) has its centre on target (col, ny − 1 − row).
 */
export function footprintRasterGeoreference(field: FootprintField, place: FootprintPlace): RasterGeoreference {
  const { nx, ny, east, north } = field;
  if (nx < 2 || ny < 2) throw new RangeError(`footprint raster: a ${nx} × ${ny} grid has no spacing`);
  const de = (east[nx - 1] - east[0]) / (nx - 1);
  const dn = (north[ny - 1] - north[0]) / (ny - 1);
  const [a, b, c, d] = place.jacobian;
  const [tE, tN] = place.target_m;
  // Local position of the outer corner of pixel (0, 0): half a spacing west and north of the north-west target.
  const e0 = east[0] - de / 2;
  const n0 = north[ny - 1] + dn / 2;
  return {
    geoTransform: [tE + a * e0 + b * n0, a * de, -b * dn, tN + c * e0 + d * n0, c * de, -d * dn],
    ...rasterCrs(place.georeference),
  };
}

/** Field values in raster order (rows north to south). */
function rasterOrder<T extends Float32Array | Uint8Array>(field: FootprintField, out: T, value: (k: number) => number): T {
  for (let row = 0; row < field.ny; row++) {
    const j = field.ny - 1 - row;
    for (let i = 0; i < field.nx; i++) out[row * field.nx + i] = value(j * field.nx + i);
  }
  return out;
}

/**
 * Minimum propellant per target, kg (Float32), nodata NaN wherever no minimum is established: unreachable,
 * failed, not computed, and the upper bounds of over-budget and relaxation-gap targets.
 */
export function footprintPropellantTiff(field: FootprintField, place: FootprintPlace, description: string): Uint8Array {
  const data = rasterOrder(field, new Float32Array(field.nx * field.ny), (k) => (field.status[k] === TARGET.reachable ? field.propellant_kg[k] : NaN));
  return writeGeoTiff({
    width: field.nx,
    height: field.ny,
    data,
    georeference: footprintRasterGeoreference(field, place),
    noData: NaN,
    description: `${description}. Minimum propellant, kg; nodata (NaN) where no minimum is established. ${CAUTION}`,
  });
}

/** The reachable-with-reserve mask (Byte): 1 within the budget, 0 certainly not, 255 (nodata) not established. */
export function footprintReachableTiff(field: FootprintField, budget_kg: number, place: FootprintPlace, description: string): Uint8Array {
  const data = rasterOrder(field, new Uint8Array(field.nx * field.ny), (k) => {
    const w = withinBudget(field, k, budget_kg);
    return w === null ? REACHABLE_MASK.noData : w === 1 ? REACHABLE_MASK.yes : REACHABLE_MASK.no;
  });
  return writeGeoTiff({
    width: field.nx,
    height: field.ny,
    data,
    georeference: footprintRasterGeoreference(field, place),
    noData: REACHABLE_MASK.noData,
    description: `${description}. Reachable with the reserve kept (propellant <= ${budget_kg} kg): 1 yes, 0 no, 255 not established. ${CAUTION}`,
  });
}
