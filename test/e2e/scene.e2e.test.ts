/**
 * The whole divert in the 3D scene (issue #13 §3): the default view frames the terrain, the ignition point,
 * the footprint and the trajectories; the vertical exaggeration keeps that framing (×1 → ×10 → ×1 never leaves
 * an empty view, nor a blank Export PNG); the first footprint a new user computes on the demo answers with a
 * grid that covers the footprint, the safe ∩ reachable set, ranked landing sites with their propellant, and
 * trajectories to them. Nothing here depends on the demo DEM's size: positions come from the scene's own API.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import * as fs from 'node:fs/promises';
import { execFileSync } from 'node:child_process';
import { openSession, screenshot, ARTIFACTS, type Session } from './browser.ts';
import { REFERENCE_PYTHON, referenceToolsReady } from '../support/reference-tools.ts';
import { pngSize } from '../../renderer/export/png-metadata.ts';

let session: Session;
// Debian chromium and Pillow: a CI run fails without them (test/support/reference-tools.ts).
const browser = referenceToolsReady('chromium');
const pillow = referenceToolsReady('pillow');

beforeAll(async () => {
  if (!browser) return;
  session = await openSession(inject('baseUrl'));
});
afterAll(async () => {
  await session?.close();
});

/**
 * Pixels of an image that carry a colour: highest minus lowest channel ≥ 30 of 255, in the columns right of
 * `fromColumnShare` of the width and the top `rows` rows (default: all). The background (#0b0f13: 8), white
 * and grey lines and labels (≈ 0) do not; the viridis drape and height colours do, even shaded (the darkest,
 * (68, 1, 84) at half light, still gives 41), as do the trajectory colours. So a blank scene gives 0 whatever
 * is drawn around it. Counted by Pillow + NumPy (Debian python3-pil / python3-numpy): an outside decoder, so
 * the check does not trust our own PNG encoder.
 */
function colouredPixels(file: string, fromColumnShare = 0, rows?: number): number {
  const script = [
    'import sys, numpy as np',
    'from PIL import Image',
    'a = np.asarray(Image.open(sys.argv[1]).convert("RGB"), dtype=np.int16)',
    'h = int(sys.argv[2]) if sys.argv[2] != "all" else a.shape[0]',
    'a = a[:h, int(a.shape[1] * float(sys.argv[3])):]',
    'print(int(((a.max(axis=2) - a.min(axis=2)) >= 30).sum()))',
  ].join('\n');
  return Number(execFileSync(REFERENCE_PYTHON, ['-c', script, file, rows === undefined ? 'all' : String(rows), String(fromColumnShare)], { encoding: 'utf8' }).trim());
}

type SceneApi = {
  framesDrawn: number;
  markerNames(): string[];
  projectAboveTarget(e: number, n: number, up: number): { x: number; y: number } | null;
  projectGroundPoint(e: number, n: number): { x: number; y: number } | null;
  terrainLayout(): { width: number; height: number; pixelSize_m: number; west_m: number; north_m: number } | null;
};

async function sceneReady(): Promise<void> {
  await session.page.waitForFunction(() => ((document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene?: SceneApi })?.landreachScene?.framesDrawn ?? 0) > 0);
}

/** Moves the exaggeration slider as a user would (input events) and waits for the frame it causes. */
async function setExaggeration(value: number): Promise<void> {
  await session.page.evaluate(async (v) => {
    const canvas = document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: SceneApi };
    const input = document.querySelector('input[aria-label="Vertical exaggeration"]') as HTMLInputElement;
    const before = canvas.landreachScene.framesDrawn;
    // Dragging passes through the steps in between, as the slider does.
    const from = Number(input.value);
    const step = v > from ? 0.5 : -0.5;
    for (let x = from + step; step > 0 ? x <= v : x >= v; x += step) {
      input.value = String(x);
      input.dispatchEvent(new Event('input', { bubbles: true }));
    }
    while (canvas.landreachScene.framesDrawn === before) await new Promise((r) => requestAnimationFrame(r));
  }, value);
}

/**
 * The scene as drawn, without the HTML legend and labels: the canvas's own PNG (toDataURL; the renderer keeps
 * its drawing buffer), saved for Pillow; and the screen area (drawing-buffer pixels) of the terrain's outline,
 * from its four corner samples projected by the scene (shoelace formula), 0 when a corner is out of view.
 */
async function canvasAndTerrainArea(name: string): Promise<{ coloured: number; terrainArea: number }> {
  const { url, corners } = await session.page.evaluate(() => {
    const canvas = document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: SceneApi };
    const t = canvas.landreachScene.terrainLayout()!;
    const east = t.west_m + (t.width - 1) * t.pixelSize_m;
    const south = t.north_m - (t.height - 1) * t.pixelSize_m;
    const corners = [[t.west_m, south], [east, south], [east, t.north_m], [t.west_m, t.north_m]].map(([e, n]) => canvas.landreachScene.projectGroundPoint(e, n));
    return { url: canvas.toDataURL('image/png'), corners };
  });
  const file = `${ARTIFACTS}/${name}-canvas.png`;
  await fs.writeFile(file, Buffer.from(url.slice(url.indexOf(',') + 1), 'base64'));
  let area = 0;
  if (corners.every((c) => c)) for (let k = 0; k < 4; k++) area += corners[k]!.x * corners[(k + 1) % 4]!.y - corners[(k + 1) % 4]!.x * corners[k]!.y;
  return { coloured: colouredPixels(file), terrainArea: Math.abs(area) / 2 };
}

/** Export PNG at 1920 × 1080 through the button; returns the file's path (kept in test-artifacts/). */
async function exportPng(name: string): Promise<string> {
  const { page } = session;
  await page.getByTestId('figure-size').selectOption('full-hd');
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-png').click()]);
  const file = `${ARTIFACTS}/${name}.png`;
  await fs.copyFile((await download.path())!, file);
  expect(pngSize(new Uint8Array(await fs.readFile(file))).width).toBe(1920);
  return file;
}

/** Drawing-buffer positions of the given points (m east/north of the target, m above its ground); null = off view. */
async function project(points: [number, number, number][]): Promise<({ x: number; y: number } | null)[]> {
  return session.page.evaluate((pts) => {
    const canvas = document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: SceneApi };
    return pts.map(([e, n, up]) => canvas.landreachScene.projectAboveTarget(e, n, up));
  }, points);
}

async function ignitionPoint(): Promise<[number, number, number]> {
  const { page } = session;
  const value = async (id: string) => Number(await page.locator(`[data-field="${id}"] input`).inputValue());
  return [await value('ignition.position_m.0'), await value('ignition.position_m.1'), await value('ignition.position_m.2')];
}

describe.runIf(browser)('the whole divert in the 3D scene', () => {
  it('frames the ignition point with the terrain, and keeps a non-blank view at ×1, ×10 and back to ×1', async () => {
    const { page } = session;
    await page.getByTestId('status-ok').waitFor();
    await sceneReady();
    const ignition = await ignitionPoint();
    expect((await project([ignition]))[0], 'ignition point in view').not.toBeNull();
    for (const [value, name] of [[1, 'scene-x1'], [10, 'scene-x10'], [1, 'scene-x1-again']] as const) {
      await setExaggeration(value);
      expect(await page.locator('.exaggeration output').textContent()).toBe(String(value));
      // The view keeps the ignition point and the nominal target's ground at every exaggeration.
      const [top, target] = await project([ignition, [0, 0, 0]]);
      expect(top, `ignition point in view at ×${value}`).not.toBeNull();
      expect(target, `nominal target in view at ×${value}`).not.toBeNull();
      const file = await exportPng(name);
      await screenshot(page, name);
      if (!pillow) continue;
      // The terrain is in view and drawn: its corners project inside the view, and at least a quarter of the
      // area they enclose is coloured (the rest: contour lines, hazard stripes, relief hiding its own far side
      // in the oblique view). A blank view has none (0, before the fix, from the first move of the slider on).
      // Framed with the whole approach, the terrain may be small at ×10 (a 1 km DEM under a 1.5 km × 10
      // approach), so the check follows its projected size instead of a fixed share of the view.
      const drawn = await canvasAndTerrainArea(name);
      expect(drawn.terrainArea, `terrain in view at ×${value}`).toBeGreaterThan(0);
      expect(drawn.coloured, `terrain drawn at ×${value}`).toBeGreaterThanOrEqual(0.25 * drawn.terrainArea);
      // The figure exported at that moment shows the scene too: coloured pixels in the scene part (1080 rows)
      // right of its legend, which figure.ts draws at the bottom left, narrower than 45 % of a 1920-pixel figure
      // (none in a blank figure). The figure is about twice the canvas's size, so the terrain covers about four
      // times the pixels; a quarter of the canvas's terrain area allows for part of it left of that line.
      expect(colouredPixels(file, 0.45, 1080), `Export PNG at ×${value}`).toBeGreaterThan(0.25 * drawn.terrainArea);
    }
    expect(session.problems).toEqual([]);
  });

  it('answers the first footprint with a grid that covers it, safe ∩ reachable, ranked sites with their propellant and trajectories to them', { timeout: 300_000 }, async () => {
    const { page } = session;
    // The first run as a new user makes it: the grid as the app sized it (no half-width typed).
    await page.getByTestId('compute').click();
    await page.waitForFunction(() => /(\d+) \/ \1 targets in/.test(document.querySelector('[data-testid="run-progress"]')?.textContent ?? ''), null, { timeout: 180_000 });
    const summary = (await page.getByTestId('footprint-summary').textContent()) ?? '';
    expect(summary).toMatch(/Guaranteed divert radius\s*\d+ m/);
    // The grid covers the footprint: its reachable region does not touch the grid's edge.
    expect(summary).not.toMatch(/limited by the grid/);
    // Safe ∩ reachable and the ranked landing sites, listed with their propellant (cheapest first).
    const sites = page.getByTestId('site');
    await sites.first().waitFor({ timeout: 60_000 });
    const texts = await sites.allTextContents();
    expect(texts.length).toBeGreaterThan(0);
    const propellant = texts.map((t) => Number(/([\d.]+) kg/.exec(t)?.[1]));
    for (const p of propellant) expect(p).toBeGreaterThan(0);
    for (let k = 1; k < propellant.length; k++) expect(propellant[k]).toBeGreaterThanOrEqual(propellant[k - 1]);
    expect(await page.getByTestId('safe-reachable-legend').textContent()).toMatch(/safe ∩ reachable/i);
    // Trajectories to the best sites are solved and drawn with the sites' markers.
    await page.waitForFunction(() => (document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: SceneApi }).landreachScene.markerNames().some((n) => n.startsWith('trajectory-')), null, { timeout: 120_000 });
    const names = await page.evaluate(() => (document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: SceneApi }).landreachScene.markerNames());
    expect(names).toContain('site-0');
    expect(names).toContain('safe-reachable');
    expect(names.some((n) => n.startsWith('trajectory-'))).toBe(true);
    // The whole divert in view: the ignition point and the footprint grid's corners (read from the top bar).
    const half = Number(await page.getByTestId('grid-half-width').inputValue());
    const ignition = await ignitionPoint();
    const inView = await project([ignition, [-half, -half, 0], [half, half, 0], [-half, half, 0], [half, -half, 0]]);
    expect(inView.every((p) => p !== null), JSON.stringify(inView)).toBe(true);
    await screenshot(page, 'scene-first-footprint');
    if (pillow) {
      const drawn = await canvasAndTerrainArea('scene-first-footprint');
      expect(drawn.coloured).toBeGreaterThanOrEqual(0.25 * drawn.terrainArea);
      expect(drawn.coloured).toBeGreaterThan(0);
    }
    expect(session.problems).toEqual([]);
  });
});
