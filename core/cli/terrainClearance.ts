/**
 * `landreach trajectory --terrain DEM`: the trajectory's clearance above the terrain. A module of its own so
 * that the trajectory command loads the DEM readers and projections only when a DEM is given.
 */
import { nominalTargetOnDem, readDem, type Flags } from './dem.ts';
import { UsageError } from './command.ts';
import { sampleBilinear, TerrainInputError } from '../terrain/grid.ts';
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
export async function terrainClearance(path: string, flags: Flags, clearance_m: number, traj: DecodedTrajectory): Promise<ClearanceFigures> {
  try {
    const { grid } = await readDem(path, flags);
    const [tE, tN] = nominalTargetOnDem(grid, flags);
    const ground = sampleBilinear(grid, tE, tN);
    if (!Number.isFinite(ground)) {
      throw new UsageError(`--target-east-m ${tE}, --target-north-m ${tN}: no terrain height at the nominal target on ${path} (outside the DEM or no-data); give a point on it`);
    }
    const frame = groundFrameOnDem(grid.georeference, [tE, tN], `--terrain ${path}`);
    const s = traj.series;
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
