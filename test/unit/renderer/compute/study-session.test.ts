/** Study session with in-thread workers running the same handlers as the Web Worker entries (demo study, tiny runs). */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { rowJobHandler, type RowJob } from '../../../../core/footprint/engine.ts';
import { descentEvaluator, type DescentFootprintContext } from '../../../../core/footprint/descentEvaluator.ts';
import { makeTargetGrid } from '../../../../core/footprint/grid.ts';
import { reserveStudy } from '../../../../core/footprint/studies.ts';
import { handleStudyJob, type StudyJob } from '../../../../core/footprint/studyWorker.ts';
import { inlineWorkerFactory } from '../../../../core/parallel/pool.ts';
import { parseStudyText } from '../../../../core/study/index.ts';
import { FootprintSession } from '../../../../renderer/compute/footprint-session.ts';
import { StudySession } from '../../../../renderer/compute/study-session.ts';

/** In-thread row workers with their own solver cache: two fresh factories solve a grid identically (cold, same order). */
function freshFootprintFactory() {
  const rows = rowJobHandler({ fromContext: (c) => descentEvaluator(c as DescentFootprintContext) });
  return inlineWorkerFactory((job: RowJob) => rows(job).result);
}
const footprintFactory = freshFootprintFactory();
const studyFactory = inlineWorkerFactory((job: StudyJob) => handleStudyJob(job).result);
const study = parseStudyText(readFileSync(new URL('../../../../assets/demo/demo-lander.study.json', import.meta.url), 'utf8'));
const grid = { grid: makeTargetGrid({ halfWidthEast_m: 3000, halfWidthNorth_m: 3000, nx: 3, ny: 3 }), side: 3, halfWidth_m: 3000 };
const altitudeInputs = { altitudes_m: [900, 1800], rule: { kind: 'fixed-velocity' as const }, reserve_kg: 250, requiredRadius_m: 900, method: 'directions' as const, directions: 4 };

describe('study session (in-thread workers)', () => {
  it('ignition altitudes by directions: one row per altitude in order, the minimum from minimumAltitude', async () => {
    const session = new StudySession(studyFactory, new FootprintSession(footprintFactory, 1));
    const seen: string[] = [];
    const r = await session.runAltitude(study, altitudeInputs, null, { onProgress: (d, t, u) => seen.push(`${d}/${t} ${u}`) });
    expect(seen).toEqual(['0/2 altitudes', '1/2 altitudes', '2/2 altitudes']);
    expect(r.rows.map((x) => x.altitude_m)).toEqual([900, 1800]);
    expect(r.cancelled).toBe(false);
    const meets = r.rows.map((x) => x.divertRadius_m >= 900);
    if (meets[0]) expect(r.minimum).toEqual({ altitude_m: 900, bracketed: false });
    else if (meets[1]) expect(r.minimum?.bracketed).toBe(true);
    else expect(r.minimum).toBeNull();
    session.close();
  }, 60_000);

  it('cancel keeps the finished altitudes; one computation at a time', async () => {
    const footprints = new FootprintSession(footprintFactory, 1);
    const session = new StudySession(studyFactory, footprints, 1);
    const going = session.runAltitude(study, altitudeInputs, null, { onProgress: (d) => d === 1 && session.cancel() });
    await expect(session.runAltitude(study, altitudeInputs, null, { onProgress: () => undefined })).rejects.toThrow(/already going/);
    const r = await going;
    expect(r.cancelled).toBe(true);
    expect(r.rows.map((x) => x.altitude_m)).toEqual([900]);
    expect(session.running).toBe(false);
    session.close();
  }, 60_000);

  it('reserve study: the rows are reserveStudy of the footprint the session computed', async () => {
    const session = new StudySession(studyFactory, new FootprintSession(freshFootprintFactory(), 1));
    const r = await session.runReserve(study, { reserves_kg: [0, 200] }, grid, { onProgress: () => undefined });
    const again = await new FootprintSession(freshFootprintFactory(), 1).run(study, grid.grid, { onRow: () => undefined });
    expect(r.rows).toEqual(reserveStudy(again.field, 500, [0, 200]));
    expect(r.rows[1].area_m2).toBeLessThanOrEqual(r.rows[0].area_m2);
    await expect(session.runReserve(study, { reserves_kg: [0] }, null, { onProgress: () => undefined })).rejects.toThrow(/needs a footprint grid: fix the grid in the top bar/);
    session.close();
  }, 60_000);
});
