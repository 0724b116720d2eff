/**
 * `landreach hazard --study`: footprint.geojson, the study's footprint over the DEM (contours, the region
 * reachable with the reserve kept, the nominal target and the ranked sites), in longitude/latitude where
 * the DEM is georeferenced in a CRS core/terrain converts. For any other CRS the rasters are still
 * written: the GeoJSON then has null geometry (local metres only) and stderr says why.
 */
import type { CliIo } from './command.ts';
import type { FootprintField } from '../footprint/field.ts';
import { footprintFigures } from '../footprint/studyFootprint.ts';
import { footprintLonLat } from '../footprint/georeferencedFootprint.ts';
import { footprintGeoJson, partialResultLine, type FootprintLonLat, type GeoJsonSite } from '../export/footprintExport.ts';
import type { Study } from '../study/index.ts';
import { TerrainInputError, type ElevationGrid } from '../terrain/grid.ts';

export function hazardFootprintGeoJson(
  study: Study,
  grid: ElevationGrid,
  field: FootprintField,
  target_m: readonly [number, number],
  sites: readonly GeoJsonSite[],
  io: CliIo,
  /** The footprint run was stopped early (a signal): the GeoJSON says so. */
  cancelled = false,
): string {
  const usable = study.vehicle.wetMass_kg - study.vehicle.dryMass_kg;
  const reserve = study.vehicle.propellantReserve_kg;
  const figures = footprintFigures(field, { usable_kg: usable, reserve_kg: reserve }, { cancelled });
  let lonLat: FootprintLonLat | null = null;
  try {
    lonLat = footprintLonLat(grid, target_m, study.planet.body, 'DEM');
  } catch (err) {
    if (!(err instanceof TerrainInputError)) throw err;
    io.stderr(`note: footprint.geojson has null geometry (local metres only): ${err.message}\n`);
  }
  return JSON.stringify(footprintGeoJson({ contours: figures.bands, reachable: figures.reachable, reserve_kg: reserve, lonLat, sites, stoppedEarly: cancelled ? (partialResultLine(field)?.replace(/^# /, '') ?? 'STOPPED EARLY') : null }));
}
