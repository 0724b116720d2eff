/**
 * The app's footprint is reproducible too (issue 11 §2): the FootprintSession with 1, 3 or 8 workers, each
 * with its own row handler (as each Web Worker has: core/footprint/worker.ts), finishing in different
 * orders, gives the same export files byte for byte (CSV, JSON report, GeoJSON, SVG map).
 */
import { describe, expect, it } from 'vitest';
import { descentEvaluator, type DescentFootprintContext } from '../../../../core/footprint/descentEvaluator.ts';
import { rowJobHandler, type RowJob } from '../../../../core/footprint/engine.ts';
import { makeTargetGrid } from '../../../../core/footprint/grid.ts';
import { footprintFigures, FOOTPRINT_NODES } from '../../../../core/footprint/studyFootprint.ts';
import { inputsHash } from '../../../../core/study/provenance.ts';
import { FootprintSession } from '../../../../renderer/compute/footprint-session.ts';
import { footprintExportText, type TextExportKind } from '../../../../renderer/compute/footprint-exports.ts';
import { lowPropellantDemo } from '../../../support/scenarios.ts';
import { scheduledWorkerFactory, type CompletionPolicy } from '../../../support/scheduled-pool.ts';

const { study } = lowPropellantDemo();
const grid = makeTargetGrid({ halfWidthEast_m: 3500, halfWidthNorth_m: 3500, nx: 7, ny: 7 });
const KINDS: TextExportKind[] = ['csv', 'json', 'geojson', 'svg'];

async function exportsWith(workers: number, policy: CompletionPolicy): Promise<Record<string, string>> {
  const factory = scheduledWorkerFactory(() => {
    const handle = rowJobHandler({ fromContext: (c) => descentEvaluator(c as DescentFootprintContext) });
    return (job: RowJob) => handle(job).result;
  }, policy);
  const session = new FootprintSession(factory, workers);
  try {
    const run = await session.run(study, grid, { onRow: () => {} });
    const figures = footprintFigures(run.field, { usable_kg: study.vehicle.wetMass_kg - study.vehicle.dryMass_kg, reserve_kg: study.vehicle.propellantReserve_kg }, { cancelled: run.cancelled });
    const inputs = { study, grid: { nx: 7, ny: 7, extent_m: 3500 }, nodes: FOOTPRINT_NODES, reserve_kg: study.vehicle.propellantReserve_kg };
    const result = { study, field: run.field, figures, inputs, inputsHash: await inputsHash(inputs), appVersion: '0.1.0' };
    return Object.fromEntries(KINDS.map((k) => [k, footprintExportText(k, result)]));
  } finally {
    session.close();
  }
}

describe('app footprint exports are reproducible', () => {
  it('are the same bytes with 1, 3 and 8 workers finishing in different orders', async () => {
    const one = await exportsWith(1, 'first-sent-first');
    expect(one.csv).toMatch(/,reachable,/);
    expect(one.csv).toMatch(/,unreachable,/);
    expect(await exportsWith(3, 'last-sent-first')).toEqual(one);
    expect(await exportsWith(8, { shuffleSeed: 5 })).toEqual(one);
  }, 120_000);
});
