import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import * as fs from 'node:fs/promises';
import * as os from 'node:os';
import * as path from 'node:path';
import { execFileSync } from 'node:child_process';
import { openSession, screenshot, type Session } from './browser.ts';
import { gdalTool, referenceToolsReady } from '../support/reference-tools.ts';
import { writeGeoTiff } from '../../core/terrain/tiff-writer.ts';

let session: Session;
// Debian chromium, and GDAL's gdaldem for the outside check of a hazard share: a CI run fails without
// them (test/support/reference-tools.ts).
const browser = referenceToolsReady('chromium', 'gdal');
let dir: string;

beforeAll(async () => {
  if (!browser) return;
  session = await openSession(inject('baseUrl'));
  dir = await fs.mkdtemp(path.join(os.tmpdir(), 'landreach-terrain-e2e-'));
});
afterAll(async () => {
  await session?.close();
  if (dir) await fs.rm(dir, { recursive: true, force: true });
});

type Layout = { width: number; height: number; pixelSize_m: number; west_m: number; north_m: number };
const layout = () =>
  session.page.evaluate(() => (document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { terrainLayout(): Layout | null } }).landreachScene.terrainLayout());

/**
 * Fraction of scene pixels that are terrain (not the background), the same count over the screen area the
 * terrain's corners enclose (`ofTerrain`: the view frames the whole divert, so a small DEM may fill little of
 * it), the probes' verdicts, and the share of pixels that changed since the previous call (the last frame is
 * kept in the page, not shipped to the test).
 */
async function sceneStats(probes: [number, number][]) {
  return session.page.evaluate((points) => {
    type Scene = {
      projectGroundPoint(e: number, n: number): { x: number; y: number } | null;
      terrainLayout(): { width: number; height: number; pixelSize_m: number; west_m: number; north_m: number };
    };
    const canvas = document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: Scene };
    const copy = document.createElement('canvas');
    copy.width = canvas.width;
    copy.height = canvas.height;
    const ctx = copy.getContext('2d')!;
    ctx.drawImage(canvas, 0, 0);
    const { data } = ctx.getImageData(0, 0, copy.width, copy.height);
    const background = [0x0b, 0x0f, 0x13];
    const differs = (i: number) => Math.max(Math.abs(data[i] - background[0]), Math.abs(data[i + 1] - background[1]), Math.abs(data[i + 2] - background[2])) > 24;
    let drawn = 0;
    for (let i = 0; i < data.length; i += 4) if (differs(i)) drawn++;
    const store = window as unknown as { lastSceneFrame?: Uint8ClampedArray };
    const last = store.lastSceneFrame;
    let changed = 0;
    if (last && last.length === data.length) for (let i = 0; i < data.length; i += 4) if (Math.abs(last[i] - data[i]) > 20) changed++;
    store.lastSceneFrame = data;
    const onGround = points.map(([e, n]) => {
      const p = canvas.landreachScene.projectGroundPoint(e, n);
      return p ? differs(4 * (Math.floor(p.y) * copy.width + Math.floor(p.x))) : null;
    });
    const t = canvas.landreachScene.terrainLayout();
    const east = t.west_m + (t.width - 1) * t.pixelSize_m;
    const south = t.north_m - (t.height - 1) * t.pixelSize_m;
    const corners = [[t.west_m, south], [east, south], [east, t.north_m], [t.west_m, t.north_m]].map(([e, n]) => canvas.landreachScene.projectGroundPoint(e, n));
    let area = 0;
    if (corners.every((c) => c)) for (let k = 0; k < 4; k++) area += corners[k]!.x * corners[(k + 1) % 4]!.y - corners[(k + 1) % 4]!.x * corners[k]!.y;
    return { fraction: drawn / (data.length / 4), ofTerrain: area ? drawn / (Math.abs(area) / 2) : 0, onGround, changed: last ? changed / (data.length / 4) : null };
  }, probes);
}

/** Waits until the scene has drawn a frame after `action`. */
async function afterFrame(action: () => Promise<unknown>) {
  const frames = () => session.page.evaluate(() => (document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { framesDrawn: number } }).landreachScene.framesDrawn);
  const before = await frames();
  await action();
  await session.page.waitForFunction((n) => (document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { framesDrawn: number } }).landreachScene.framesDrawn > n, before);
}

// A test DEM (invented): 161 × 161 cells of 5 m in UTM zone 33 N (EPSG:32633), flat at 300 m in the west and
// a 30° ramp east of 500 m from its west edge. Written with core/terrain's GeoTIFF writer.
const SIDE = 161;
const PIXEL = 5;
function rampDem(): Uint8Array {
  const data = new Float32Array(SIDE * SIDE);
  for (let r = 0; r < SIDE; r++) {
    for (let c = 0; c < SIDE; c++) {
      const e = (c + 0.5) * PIXEL;
      data[r * SIDE + c] = 300 + (e > 500 ? (e - 500) * Math.tan(Math.PI / 6) : 0);
    }
  }
  return writeGeoTiff({ width: SIDE, height: SIDE, data, georeference: { geoTransform: [500000, PIXEL, 0, 4500000, 0, -PIXEL], projectedEpsg: 32633 }, description: 'invented test ramp' });
}

describe.runIf(browser)('terrain in Chromium', () => {
  it('opens on the bundled INVENTED demo DEM, draws it and stripes its hazards', async () => {
    const { page } = session;
    await page.getByTestId('status-ok').waitFor();
    await page.waitForFunction(() => ((document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene?: { framesDrawn: number } })?.landreachScene?.framesDrawn ?? 0) > 0);
    expect(await page.getByTestId('terrain-name').textContent()).toMatch(/INVENTED demo DEM: Orvessa Plain \(invented\)/);
    expect(await page.locator('.legend-title').textContent()).toMatch(/Terrain height \(m\) — INVENTED demo DEM/);
    // assets/demo/terrain/demo-site.json: 2000 × 2000 cells of 10 m, equirectangular on a Mars-sized sphere
    // (gdalinfo shows the CRS: test/reference/terrain/demo-site.test.ts).
    expect(await page.getByTestId('terrain-size').textContent()).toBe('2000 × 2000 cells (20,000 m × 20,000 m)');
    expect(await page.getByTestId('terrain-crs').textContent()).toBe('projected, user-defined CRS "Equirectangular, Mars sphere, Orvessa Plain (invented)" (equirectangular)');
    expect(await page.getByTestId('terrain-safe').textContent()).toMatch(/^\d+\.\d % /);
    // Decimated for display to 250 × 250 samples of 80 m (8 × 8 blocks: at most 257 × 257 vertices), centred on
    // the nominal target (the DEM's centre): the first sample's centre is 40 m inside the ±10 km edge.
    expect(await layout()).toEqual({ width: 250, height: 250, pixelSize_m: 80, west_m: -9960, north_m: 9960 });
    const shown = await sceneStats([[-450, 450], [450, 450], [-450, -450], [450, -450], [0, 0]]);
    expect(shown.onGround).toEqual([true, true, true, true, true]);
    // Drawn over at least half the area the terrain's corners enclose on screen (relief may hide some of the
    // far side), however small the DEM is next to the approach the view also frames.
    expect(shown.ofTerrain).toBeGreaterThan(0.5);
    // The hazard stripes come from the DEM's own hazard map: turning them off changes the picture (seen close
    // on the terrain: the default view frames the whole approach, where a small DEM is a few pixels).
    await afterFrame(() => page.getByTestId('view-site').click());
    await sceneStats([]);
    await afterFrame(() => page.getByTestId('hazard-toggle').uncheck());
    const plain = await sceneStats([]);
    expect(plain.changed).toBeGreaterThan(0.005);
    await page.getByTestId('hazard-toggle').check();
    await screenshot(page, 'terrain-demo');
    expect(session.problems).toEqual([]);
  });

  it('loads another GeoTIFF through the file input, with its hazard share checked against gdaldem slope', async () => {
    const { page } = session;
    const file = path.join(dir, 'ramp.tif');
    await fs.writeFile(file, rampDem());
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('load-dem').click()]);
    await chooser.setFiles(file);
    await page.waitForFunction(() => document.querySelector('[data-testid="terrain-name"]')?.textContent === 'ramp.tif');
    expect(await page.getByTestId('terrain-size').textContent()).toBe('161 × 161 cells (805 m × 805 m)');
    expect(await page.getByTestId('terrain-crs').textContent()).toBe('projected, EPSG:32633 (transverse Mercator)');
    await page.waitForFunction(() => /ramp\.tif/.test(document.querySelector('.legend-title')?.textContent ?? ''));
    // Every cell shown (161² < the display limit); the target at the DEM's centre (500 402.5 m E, 4 499 597.5 m N).
    expect(await layout()).toEqual({ width: 161, height: 161, pixelSize_m: 5, west_m: -400, north_m: 400 });
    // Outside check: at 5 m pixels the 4 m lander footprint is not resolvable, so the hazard map is Horn slope
    // against the 10° default, edges unknown. GDAL's `gdaldem slope` (Horn, Debian gdal-bin) on the same file,
    // edge cells no-data as in ours: the safe share is the share of cells at or below 10°.
    const asc = path.join(dir, 'slope.asc');
    execFileSync(gdalTool('gdaldem'), ['slope', '-q', '-of', 'AAIGrid', file, asc]);
    const lines = (await fs.readFile(asc, 'utf8')).trim().split('\n');
    const noData = Number(lines.find((l) => /^NODATA_value/i.test(l))?.split(/\s+/)[1] ?? NaN);
    const values = lines.filter((l) => /^\s*[-\d.]/.test(l)).flatMap((l) => l.trim().split(/\s+/).map(Number));
    expect(values).toHaveLength(SIDE * SIDE);
    const safe = values.filter((v) => v !== noData && v <= 10).length / values.length;
    const shownSafe = Number(/^([\d.]+) %/.exec((await page.getByTestId('terrain-safe').textContent()) ?? '')![1]);
    expect(shownSafe).toBeCloseTo(100 * safe, 1);
    expect(await page.getByTestId('terrain-safe').textContent()).toMatch(/roughness not assessed/);
    // A new slope limit re-runs the analysis in the worker: at 35° the 30° ramp is safe too (GDAL count again).
    const before = await page.getByTestId('terrain-safe').textContent();
    const maxSlope = page.locator('[data-terrain-field="maxSlope_deg"] input');
    await maxSlope.fill('35');
    await maxSlope.press('Enter');
    await page.waitForFunction((text) => document.querySelector('[data-testid="terrain-safe"]')?.textContent !== text, before);
    const safe35 = values.filter((v) => v !== noData && v <= 35).length / values.length;
    expect(Number(/^([\d.]+) %/.exec((await page.getByTestId('terrain-safe').textContent()) ?? '')![1])).toBeCloseTo(100 * safe35, 1);
    await maxSlope.fill('10');
    await maxSlope.press('Enter');
    await page.waitForFunction((text) => document.querySelector('[data-testid="terrain-safe"]')?.textContent === text, before);
    const drawn = await sceneStats([[-350, 350], [350, -350]]);
    expect(drawn.onGround).toEqual([true, true]);
    await screenshot(page, 'terrain-ramp');
  });

  it('places the nominal target where asked on the DEM, and explains a position off it', async () => {
    const { page } = session;
    const east = page.locator('[data-terrain-field="targetEast_m"] input');
    await east.fill('1000');
    await east.press('Enter');
    expect(await page.getByTestId('terrain-problem-targetEast_m').textContent()).toBe(
      'Target east on the DEM (m) “1000”: the target must be on the DEM, from 500000 to 500805 m (blank = its centre, 500402.5 m).',
    );
    // The scene keeps the last valid placement meanwhile.
    expect((await layout())!.west_m).toBe(-400);
    await afterFrame(async () => {
      await east.fill('500102.5');
      await east.press('Enter');
    });
    expect(await page.getByTestId('terrain-problem-targetEast_m').count()).toBe(0);
    // Column 0's centre (500 002.5 m E) is now 100 m west of the nominal target.
    expect((await layout())!.west_m).toBeCloseTo(-100, 9);
  });

  it('refuses a corrupt file with a notice naming it and keeps the terrain shown', async () => {
    const { page } = session;
    const file = path.join(dir, 'broken.tif');
    await fs.writeFile(file, rampDem().subarray(0, 300));
    const before = await layout();
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('load-dem').click()]);
    await chooser.setFiles(file);
    const notice = page.getByTestId('notice').filter({ hasText: 'broken.tif' });
    await notice.waitFor();
    expect(await notice.textContent()).toMatch(/broken\.tif: .*The terrain shown is kept\./);
    expect(await page.getByTestId('terrain-name').textContent()).toBe('ramp.tif');
    expect(await layout()).toEqual(before);
    await screenshot(page, 'terrain-corrupt-refused');
    // Back to the demo DEM, its target at its centre again.
    await page.getByTestId('demo-dem').click();
    await page.waitForFunction(() => /INVENTED/.test(document.querySelector('[data-testid="terrain-name"]')?.textContent ?? ''));
    expect(await layout()).toEqual({ width: 250, height: 250, pixelSize_m: 80, west_m: -9960, north_m: 9960 });
    expect(session.problems).toEqual([]);
  });
});
