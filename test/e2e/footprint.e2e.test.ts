import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import * as fs from 'node:fs/promises';
import { openSession, screenshot, type Session } from './browser.ts';
import { referenceToolsReady } from '../support/reference-tools.ts';

let session: Session;
// Debian chromium: a CI run fails without it (test/support/reference-tools.ts).
const browser = referenceToolsReady('chromium');
const DEMO_STUDY = new URL('../../assets/demo/demo-lander.study.json', import.meta.url);
// The invented site's 2 km inset at 2 m about the nominal target: small grids drape over it at a fine scale.
const DEMO_INSET = new URL('../../assets/demo/terrain/demo-inset.tif', import.meta.url);

beforeAll(async () => {
  if (!browser) return;
  session = await openSession(inject('baseUrl'));
});
afterAll(async () => {
  await session?.close();
});

/**
 * Fraction of the terrain's pixels whose colour is close to viridis' yellow end or purple end (the drape's
 * extremes), and white. Counted inside the box the terrain's corners project to (the top view draws it as a
 * north-up rectangle), so the shares do not depend on how much else the view frames (ignition point,
 * approach) around a small DEM.
 */
async function drapeStats() {
  // The scene appears once the demo DEM has been read (a worker, after start-up).
  await session.page.waitForFunction(() => ((document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene?: { framesDrawn: number } })?.landreachScene?.framesDrawn ?? 0) > 0);
  return session.page.evaluate(() => {
    type Scene = {
      terrainLayout(): { width: number; height: number; pixelSize_m: number; west_m: number; north_m: number };
      projectGroundPoint(e: number, n: number): { x: number; y: number } | null;
    };
    const canvas = document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: Scene };
    const t = canvas.landreachScene.terrainLayout();
    const east = t.west_m + (t.width - 1) * t.pixelSize_m;
    const south = t.north_m - (t.height - 1) * t.pixelSize_m;
    const corners = [[t.west_m, south], [east, south], [east, t.north_m], [t.west_m, t.north_m]].map(([e, n]) => canvas.landreachScene.projectGroundPoint(e, n)!);
    const x0 = Math.max(0, Math.floor(Math.min(...corners.map((c) => c.x))));
    const y0 = Math.max(0, Math.floor(Math.min(...corners.map((c) => c.y))));
    const x1 = Math.min(canvas.width, Math.ceil(Math.max(...corners.map((c) => c.x))));
    const y1 = Math.min(canvas.height, Math.ceil(Math.max(...corners.map((c) => c.y))));
    const copy = document.createElement('canvas');
    copy.width = canvas.width;
    copy.height = canvas.height;
    const ctx = copy.getContext('2d')!;
    ctx.drawImage(canvas, 0, 0);
    const { data } = ctx.getImageData(x0, y0, x1 - x0, y1 - y0);
    let yellowGreen = 0;
    let purpleBlue = 0;
    let white = 0;
    for (let i = 0; i < data.length; i += 4) {
      const [r, g, b] = [data[i], data[i + 1], data[i + 2]];
      // Viridis runs from dark purple (68, 1, 84) through teal to yellow (253, 231, 37); the lit terrain's
      // height colouring uses the same map, so only the share of each end changes: counted, not assumed.
      if (g > 150 && b < 110 && g > r * 0.8) yellowGreen++;
      if (b > g && r < 110 && b > 70) purpleBlue++;
      if (r > 230 && g > 230 && b > 220) white++;
    }
    const n = data.length / 4;
    return { yellowGreen: yellowGreen / n, purpleBlue: purpleBlue / n, white: white / n };
  });
}

describe.runIf(browser)('footprint in Chromium (demo study, small grids)', () => {
  it('opens the invented demo study', async () => {
    const { page } = session;
    await page.getByTestId('status-ok').waitFor();
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
    await chooser.setFiles(DEMO_STUDY.pathname);
    await page.waitForFunction(() => (document.querySelector('[data-testid="study-name"]') as HTMLInputElement).value.startsWith('Demo: invented lander'));
    expect(await page.locator('[data-field="vehicle.thrustPerEngine_N"] input').inputValue()).toBe('3300');
    expect(await page.locator('[data-field="ignition.position_m.0"] input').inputValue()).toBe('-2500');
    expect(await page.getByTestId('status-ok').count()).toBe(1);
    const [dem] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('load-dem').click()]);
    await dem.setFiles(DEMO_INSET.pathname);
    await page.waitForFunction(() => document.querySelector('[data-testid="terrain-size"]')?.textContent === '1000 × 1000 cells (2,000 m × 2,000 m)');
  });

  it('computes a 7 × 7 footprint in workers, drapes it on the terrain and outlines the reserve boundary', async () => {
    const { page } = session;
    // Both measured in the top view (the terrain a north-up rectangle), before and after.
    await page.getByTestId('view-top').click();
    await page.waitForTimeout(200);
    const before = await drapeStats();
    // The grid lies on the demo inset (±1000 m about its centre). Over ±500 m the demo study's minimum propellant
    // runs from about 204 to 240 kg (`landreach footprint --grid 7x7 --extent-m 500`), so a 280 kg reserve
    // (budget 500 − 280 = 220 kg) puts the reserve boundary inside the grid.
    await page.locator('[data-field="vehicle.propellantReserve_kg"] input').fill('280');
    await page.getByTestId('status-ok').waitFor();
    await page.getByTestId('grid-side').fill('7');
    await page.getByTestId('grid-half-width').fill('500');
    // The scene stays live during the run: a view change draws a new frame while the run is going. To know
    // the run is going without racing it, the test holds it: this first run creates the footprint workers,
    // and until their script is delivered (held here, released below) no target can finish, however fast
    // or slow the machine. Messages posted to a worker wait for its script, so nothing is lost.
    let release!: () => void;
    const held = new Promise<void>((resolve) => (release = resolve));
    let workerRequested!: () => void;
    const requested = new Promise<void>((resolve) => (workerRequested = resolve));
    const workerScript = /\/footprint\.worker-[^/]*\.js$/;
    const delivered: Promise<void>[] = [];
    await page.route(workerScript, (route) => {
      workerRequested();
      const delivery = held.then(() => route.continue());
      delivered.push(delivery);
      return delivery;
    });
    await page.getByTestId('compute').click();
    await requested;
    await page.getByTestId('run-progress').waitFor();
    const framesAtStart = await page.evaluate(() => (document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { framesDrawn: number } }).landreachScene.framesDrawn);
    await page.getByTestId('view-top').click();
    await page.waitForFunction(
      (start) => (document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { framesDrawn: number } }).landreachScene.framesDrawn > start,
      framesAtStart,
    );
    // Drawn while the run is going, with no target finished: the workers have not even started.
    const bar = page.getByTestId('run-progress').getByRole('progressbar');
    expect(await bar.getAttribute('aria-valuetext')).toMatch(/^0 \/ 49 targets/);
    expect(await page.getByTestId('run-cancel').count()).toBe(1);
    release();
    await Promise.all(delivered);
    await page.unroute(workerScript);
    await page.waitForFunction(() => /49 \/ 49 targets in/.test(document.querySelector('[data-testid="run-progress"]')?.textContent ?? ''), null, { timeout: 60_000 });
    await page.waitForTimeout(300);
    const summary = (await page.getByTestId('footprint-summary').textContent()) ?? '';
    expect(summary).toMatch(/Reachable area\s*[\d.]+ km²/);
    expect(summary).toMatch(/Guaranteed divert radius\s*\d+ m/);
    // Budget: the demo study's usable 2100 − 1600 = 500 kg (assets/demo) less the 280 kg reserve.
    expect(summary).toMatch(/Budget\s*220\.0 kg/);
    expect(await page.getByTestId('reserve-legend').textContent()).toMatch(/≤ 220 kg/);
    expect(await page.locator('.legend-title').textContent()).toMatch(/propellant.*\(kg\)/i);
    await screenshot(page, 'footprint-7x7-top');
    await page.getByTestId('view-oblique').click();
    await page.waitForTimeout(200);
    await screenshot(page, 'footprint-7x7-oblique');
    await page.getByTestId('view-top').click();
    await page.waitForTimeout(200);
    const after = await drapeStats();
    // Draped propellant replaces the height colouring inside the grid: the scene's colour mix changes, and
    // the reserve boundary adds white line pixels.
    expect(Math.abs(after.yellowGreen - before.yellowGreen) + Math.abs(after.purpleBlue - before.purpleBlue)).toBeGreaterThan(0.02);
    expect(after.white).toBeGreaterThan(before.white);
    expect(session.problems).toEqual([]);
  });

  it('exports the footprint CSV: one row per target with units in the header', async () => {
    const { page } = session;
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-csv').click()]);
    expect(download.suggestedFilename()).toMatch(/-footprint\.csv$/);
    const text = await fs.readFile((await download.path())!, 'utf8');
    const lines = text.trim().split('\n');
    expect(lines[0]).toMatch(/^# Preliminary design/);
    expect(lines[1]).toBe('east_m,north_m,status,propellant_kg,time_of_flight_s,peak_tilt_deg,miss_m,solves,within_budget,between_nodes');
    const rows = lines.slice(2).map((l) => l.split(','));
    expect(rows).toHaveLength(49);
    // The grid's corners are at ±500 m.
    expect(rows[0].slice(0, 2)).toEqual(['-500', '-500']);
    expect(rows[48].slice(0, 2)).toEqual(['500', '500']);
    for (const r of rows) expect(['reachable', 'unreachable', 'failed']).toContain(r[2]);
    // within_budget agrees with the 220 kg budget, and the boundary runs through the grid: both kinds occur.
    const reachable = rows.filter((x) => x[2] === 'reachable');
    for (const r of reachable) expect(r[8]).toBe(Number(r[3]) <= 220 ? '1' : '0');
    expect(rows.some((r) => r[8] === '1')).toBe(true);
    expect(rows.some((r) => r[8] === '0')).toBe(true);
    await fs.writeFile(new URL('../../test-artifacts/footprint-7x7.csv', import.meta.url), text);
    // Pixel readback against the exported numbers: where the scene draws the cheapest target the drape is
    // viridis' dark end, where it draws the dearest, its bright end (green channel: 1 at the purple end,
    // 231 at the yellow end of viridis; lighting scales both). Median of 5 × 5 pixels, past 1-px lines.
    // Interior targets only, away from the grid's outer ring.
    const byCost = reachable.filter((r) => Math.abs(Number(r[0])) < 400 && Math.abs(Number(r[1])) < 400).sort((a, b) => Number(a[3]) - Number(b[3]));
    const [cheap, dear] = [byCost[0], byCost[byCost.length - 1]].map((r) => [Number(r[0]), Number(r[1])]);
    const greens = await page.evaluate(([a, b]) => {
      const canvas = document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { projectGroundPoint(e: number, n: number): { x: number; y: number } | null } };
      const copy = document.createElement('canvas');
      copy.width = canvas.width;
      copy.height = canvas.height;
      const ctx = copy.getContext('2d')!;
      ctx.drawImage(canvas, 0, 0);
      const scale = canvas.width / canvas.clientWidth;
      return [a, b].map(([e, n]) => {
        const p = canvas.landreachScene.projectGroundPoint(e, n)!;
        const { data } = ctx.getImageData(Math.round(p.x * scale) - 2, Math.round(p.y * scale) - 2, 5, 5);
        const g: number[] = [];
        for (let i = 0; i < data.length; i += 4) g.push(data[i + 1]);
        return g.sort((x, y) => x - y)[12];
      });
    }, [cheap, dear]);
    expect(greens[1] - greens[0]).toBeGreaterThan(60);
  });

  it('exports the JSON report and the SVG map with the caution and the inputs hash', async () => {
    const { page, context } = session;
    const [json] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-json').click()]);
    expect(json.suggestedFilename()).toMatch(/-footprint\.json$/);
    const report = JSON.parse(await fs.readFile((await json.path())!, 'utf8'));
    expect(report.caution).toMatch(/^Preliminary design and trade studies only; not flight software/);
    expect(report.inputsHash).toMatch(/^[0-9a-f]{64}$/);
    expect(report).toMatchObject({ format: 'landreach-footprint', version: 2, stoppedEarly: false, summary: { budget_kg: 220, targets: 49, pending: 0 }, grid: { nx: 7, ny: 7 } });
    const [svg] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-svg').click()]);
    const svgText = await fs.readFile((await svg.path())!, 'utf8');
    expect(svgText).toMatch(/^<svg[^>]*xmlns="http:\/\/www\.w3\.org\/2000\/svg"/);
    expect(svgText).toContain('Preliminary design and trade studies only');
    const svgFile = new URL('../../test-artifacts/footprint-7x7.svg', import.meta.url);
    await fs.writeFile(svgFile, svgText);
    // Chromium renders the exported map on its own, outside the app (a report reader's view of it).
    const viewer = await context.newPage();
    await viewer.goto(svgFile.href);
    await viewer.screenshot({ path: new URL('../../test-artifacts/footprint-7x7-svg-rendered.png', import.meta.url).pathname });
    await viewer.close();
    const [geo] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-geojson').click()]);
    const collection = JSON.parse(await fs.readFile((await geo.path())!, 'utf8'));
    expect(collection.type).toBe('FeatureCollection');
    expect(collection.features[0].properties).toMatchObject({ kind: 'reachable-with-reserve', level_kg: 220, reserve_kg: 280 });
  });

  it('marks the footprint stale when an input changes, and current again when undone', async () => {
    const { page } = session;
    const isp = page.locator('[data-field="vehicle.isp_s"] input');
    await isp.fill('231');
    await page.getByTestId('footprint-stale').waitFor();
    await page.getByTestId('undo').click();
    await page.getByTestId('footprint-stale').waitFor({ state: 'detached' });
  });

  it('picks a target and shows its optimal trajectory in the scene and the charts', async () => {
    const { page } = session;
    // Close the export notices first: they sit over the scene where the target is clicked.
    await page.evaluate('document.querySelectorAll(\'[data-testid="notice"] button\').forEach((b) => b.click())');
    await page.waitForFunction(() => document.querySelectorAll('[data-testid="notice"]').length === 0);
    // Back to a 200 kg reserve (budget 300 kg): the picked target below (about 236 kg) and its polynomial-guidance
    // baseline both fit it. The reserve is a contour level of the field, so the footprint's range still applies.
    await page.locator('[data-field="vehicle.propellantReserve_kg"] input').fill('200');
    await page.getByTestId('status-ok').waitFor();
    // The run flew its best landing sites (their picks come first); remove them so the click below is pick 1.
    while ((await page.getByTestId('pick').count()) > 0) await page.getByRole('button', { name: 'Remove target 1' }).click();
    const point = await page.evaluate(() => {
      const canvas = document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { projectGroundPoint(e: number, n: number): { x: number; y: number } | null } };
      const p = canvas.landreachScene.projectGroundPoint(500, -300);
      const box = canvas.getBoundingClientRect();
      return p ? { x: box.left + p.x, y: box.top + p.y } : null;
    });
    expect(point).not.toBeNull();
    await page.mouse.click(point!.x, point!.y);
    await page.getByTestId('trajectory-summary').waitFor({ timeout: 30_000 });
    const text = (await page.getByTestId('trajectory-summary').textContent()) ?? '';
    expect(text).toMatch(/Propellant\s*[\d.]+ kg/);
    // The picked target (500 m E, 300 m S) is solved at the study's N = 50 (the grid at N = 30): its
    // propellant lies within the range over the grid's reachable targets.
    const propellant = Number(/Propellant\s*([\d.]+) kg/.exec(text)![1]);
    const range = /Propellant\s*([\d.]+) … ([\d.]+) kg/.exec((await page.getByTestId('footprint-summary').textContent()) ?? '')!;
    expect(propellant).toBeGreaterThanOrEqual(Number(range[1]));
    expect(propellant).toBeLessThanOrEqual(Number(range[2]));
    expect(text).toMatch(/Time of flight t_f\s*[\d.]+ s/);
    // The polynomial-guidance baseline to the same target costs more than the optimum (which is a lower
    // bound on any trajectory landing there); shown dashed in the scene on request.
    const baseline = /Polynomial guidance\s*([\d.]+) kg\+([\d.]+) kg/.exec(text)!;
    expect(Number(baseline[1])).toBeGreaterThan(propellant);
    expect(Number(baseline[2])).toBeCloseTo(Number(baseline[1]) - propellant, 1);
    const markers = () => page.evaluate(() => (document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { markerNames(): string[] } }).landreachScene.markerNames());
    expect(await markers()).not.toContain('baseline-0');
    await page.getByTestId('show-baseline').check();
    await page.waitForFunction(() => (document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { markerNames(): string[] } }).landreachScene.markerNames().includes('baseline-0'));
    expect(await markers()).toContain('trajectory-0');
    await page.getByTestId('chart-tab-throttle').click();
    // data-series lists "label:points" per dataset of the chart's configuration.
    const series = ((await page.locator('[data-testid="trajectory-plot"] canvas').getAttribute('data-series')) ?? '').split('|');
    // The study's N = 50 nodes give 50 throttle samples for the picked target.
    expect(series.some((d) => /^Target 1.*:50$/.test(d))).toBe(true);
    await screenshot(page, 'trajectory-picked');
    expect(session.problems).toEqual([]);
  });

  it('cancels a run mid-way and keeps the finished rows', async () => {
    const { page } = session;
    // 41 × 41 (1,681 targets, about half a minute here): long enough that the cancel lands mid-run.
    await page.getByTestId('grid-side').fill('41');
    await page.getByTestId('compute').click();
    // Wait for a few rows, then cancel.
    await page.waitForFunction(() => {
      const m = /([\d,]+) \/ 1,681 targets/.exec(document.querySelector('[data-testid="run-progress"]')?.textContent ?? '');
      return m !== null && Number(m[1].replace(/,/g, '')) >= 30;
    }, null, { timeout: 60_000 });
    // Mid-run the bar reports the rate and the time left.
    expect(await page.getByTestId('run-progress').textContent()).toMatch(/targets · [\d.]+ \/s · about .+ left/);
    await page.getByTestId('run-cancel').click();
    await page.waitForFunction(() => /Cancelled: [\d,]+ \/ 1,681 targets kept/.test(document.querySelector('[data-testid="run-progress"]')?.textContent ?? ''));
    const kept = Number(/Cancelled: ([\d,]+)/.exec((await page.getByTestId('run-progress').textContent()) ?? '')![1].replace(/,/g, ''));
    expect(kept).toBeGreaterThanOrEqual(30);
    expect(kept).toBeLessThan(1681);
    expect(kept % 41).toBe(0);
    const summary = (await page.getByTestId('footprint-summary').textContent()) ?? '';
    expect(summary).toContain(`${1681 - kept} not computed (cancelled)`);
    await screenshot(page, 'footprint-cancelled');
    // The partial result exports as such: pending rows have an empty within_budget.
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-csv').click()]);
    const rows = (await fs.readFile((await download.path())!, 'utf8')).trim().split('\n').slice(2);
    expect(rows.filter((r) => r.split(',')[2] === 'pending')).toHaveLength(1681 - kept);
    expect(session.problems).toEqual([]);
  });
});
