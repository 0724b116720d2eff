/**
 * `landreach trajectory --terrain DEM`: the trajectory's clearance above the terrain. A module of its own so
 * that the trajectory command loads the DEM readers and projections only when a DEM is given.
 */
import { demReadLine, nominalTargetOnDem, openDem, type Flags } from './dem.ts';
import { UsageError, type CliIo } from './command.ts';
import { sampleBilinear, TerrainInputError, type ElevationGrid } from '../terrain/grid.ts';
import { groundRegionOnDem } from '../terrain/dem-region.ts';
import { checkTerrainClearance } from '../terrain/sites.ts';
import { groundFrameOnDem } from '../terrain/groundFrame.ts';
import type { DecodedTrajectory } from '../descent/trajectory.ts';

export interface ClearanceFigures {
  dem: string;
  clearance_m: number;
  minClearance_m: number;
  nodeViolations: number;
  segmentViolations: number;
  unknown: number;
  ok: boolean;
}

/**
 * Clearance of the trajectory above the terrain (core/terrain checkTerrainClearance): the study frame's
 * origin is the nominal target, placed on the DEM (its centre unless given) through the same ground frame as
 * the footprint's, and heights are relative to the terrain there. The final node sits on the ground by
 * construction and is not checked.
 */
export async function terrainClearance(path: string, flags: Flags, clearance_m: number, traj: DecodedTrajectory, io: CliIo): Promise<ClearanceFigures> {
  try {
    const opened = await openDem(path, flags);
    const [tE, tN] = nominalTargetOnDem(opened.frame, flags);
    const frame = groundFrameOnDem(opened.frame.georeference, [tE, tN], `--terrain ${path}`);
    const s = traj.series;
    let grid: ElevationGrid;
    try {
      // Only the window under the ground track (ignition to target) is read, plus two pixels for the
      // bilinear samples: at full resolution when it fits MAX_GRID_CELLS, else at the finest resolution that
      // fits (an overview, else block averages, which smooth peaks narrower than a cell: said on stderr).
      if (opened.dem) {
        const track = Array.from(s.t, (_, k) => [s.x[k], s.y[k]] as const);
        const margin = 2 * Math.max(opened.frame.pixelSizeX_m, opened.frame.pixelSizeY_m);
        const region = groundRegionOnDem(frame, { west_m: 0, east_m: 0, south_m: 0, north_m: 0 }, margin, track);
        const read = await opened.dem.readRegion({ ...region, resolution: 'fit', what: 'the trajectory\'s ground track' });
        io.stderr(demReadLine(opened.name, read.report, read.grid));
        if (read.report.decimation > 1 || read.report.overview) io.stderr(`note: the terrain under the track is at ${read.grid.pixelSizeX_m.toPrecision(4)} m cells (averages), not the DEM's ${opened.frame.pixelSizeX_m.toPrecision(4)} m: peaks narrower than a cell are smoothed in the clearance check\n`);
        grid = read.grid;
      } else grid = opened.grid!;
    } finally {
      await opened.close();
    }
    const ground = sampleBilinear(grid, tE, tN);
    if (!Number.isFinite(ground)) {
      throw new UsageError(`--target-east-m ${tE}, --target-north-m ${tN}: no terrain height at the nominal target on ${path} (outside the DEM or no-data); give a point on it`);
    }
    const nodes = Array.from(s.t, (_, k) => {
      const [e, n] = frame.toDem(s.x[k], s.y[k]);
      return { east_m: e, north_m: n, up_m: ground + s.z[k] };
    });
    const rep = checkTerrainClearance(grid, nodes, clearance_m, 1);
    return {
      dem: path, clearance_m, minClearance_m: rep.minClearance_m, nodeViolations: rep.violations.length,
      segmentViolations: rep.segmentViolations.length, unknown: rep.unknown.length, ok: rep.ok,
    };
  } catch (err) {
    if (err instanceof TerrainInputError) throw new UsageError(err.message);
    throw err;
  }
}
