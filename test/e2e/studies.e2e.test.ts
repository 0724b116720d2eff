/**
 * Trade studies in Chromium on the invented demo study, kept small for two CI cores: an ignition-altitude
 * sweep by the reach boundary (3 altitudes, 6 directions) and a reserve study on a 5 × 5 footprint.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import * as fs from 'node:fs/promises';
import { openSession, screenshot, type Session } from './browser.ts';
import { referenceToolsReady } from '../support/reference-tools.ts';

let session: Session;
// Debian chromium: a CI run fails without it (test/support/reference-tools.ts).
const browser = referenceToolsReady('chromium');
const DEMO_STUDY = new URL('../../assets/demo/demo-lander.study.json', import.meta.url);

beforeAll(async () => {
  if (!browser) return;
  session = await openSession(inject('baseUrl'));
});
afterAll(async () => {
  await session?.close();
});

/** The "label:points" list the plot's canvas carries (PlotPanel's data-series). */
async function plotSeries(): Promise<string[]> {
  return ((await session.page.getByTestId('study-plot').locator('canvas').getAttribute('data-series')) ?? '').split('|');
}

describe.runIf(browser)('trade studies in Chromium (demo study)', () => {
  it('opens the demo study and shows the studies area with the study defaults', async () => {
    const { page } = session;
    await page.getByTestId('status-ok').waitFor();
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
    await chooser.setFiles(DEMO_STUDY.pathname);
    await page.waitForFunction(() => (document.querySelector('[data-testid="study-name"]') as HTMLInputElement).value.startsWith('Demo: invented lander'));
    await page.getByTestId('study-tab-ignition-altitude').click();
    // Defaults: 0.6 … 1.4 × the demo study's 1800 m ignition altitude (assets/demo), and its 150 kg reserve.
    expect(await page.getByTestId('study-altitudes').inputValue()).toBe('1080, 1440, 1800, 2160, 2520');
    expect(await page.getByTestId('study-altitude-reserve').inputValue()).toBe('150');
  });

  it('names the field and the fix for a bad input, and will not run', async () => {
    const { page } = session;
    await page.getByTestId('study-altitudes').fill('1200, -5');
    expect(await page.locator('[data-study-field="altitudes"] .problem').textContent()).toMatch(/Altitude -5 m: each ignition altitude must be above the target/);
    expect(await page.getByTestId('study-run').isDisabled()).toBe(true);
  });

  it('runs an ignition-altitude sweep in workers: chart points, requirement line, minimum altitude', async () => {
    const { page } = session;
    await page.getByTestId('study-altitudes').fill('900, 1400, 1800');
    await page.getByTestId('study-directions').fill('6');
    await page.getByTestId('study-altitude-reserve').fill('250');
    await page.getByTestId('study-required-radius').fill('900');
    await page.getByTestId('study-run').click();
    await page.getByTestId('study-progress').waitFor();
    await page.waitForFunction(() => /3 \/ 3 altitudes in/.test(document.querySelector('[data-testid="study-progress"]')?.textContent ?? ''), null, { timeout: 45_000 });
    const series = await plotSeries();
    expect(series).toContain('Guaranteed divert radius:3');
    expect(series).toContain('Requirement 900 m:2');
    const table = await page.getByTestId('study-table-ignition-altitude').locator('tbody tr').allTextContents();
    expect(table).toHaveLength(3);
    // The verdict agrees with the table: on the demo study the 900 m requirement falls between the first and
    // the last altitude, so the minimum is interpolated linearly between the sampled altitudes around it
    // (recomputed here from the table's rounded radii, hence the few-metre tolerance).
    const radii = (await page.getByTestId('study-table-ignition-altitude').locator('tbody tr td:nth-child(2)').allTextContents()).map((t) => Number.parseFloat(t));
    const altitudes = [900, 1400, 1800];
    expect(radii[0]).toBeLessThan(900);
    expect(radii[2]).toBeGreaterThanOrEqual(900);
    const k = radii.findIndex((r) => r >= 900);
    const expected = altitudes[k - 1] + ((900 - radii[k - 1]) / (radii[k] - radii[k - 1])) * (altitudes[k] - altitudes[k - 1]);
    const verdict = (await page.getByTestId('minimum-altitude').textContent()) ?? '';
    expect(verdict).toMatch(/Minimum ignition altitude for a 900 m divert radius: \d+ m \(with 250 kg in reserve; interpolated/);
    const at = Number(/radius: (\d+) m/.exec(verdict)![1]);
    expect(Math.abs(at - expected)).toBeLessThan(10);
    expect(series).toContain(`Minimum ignition altitude ${at} m:2`);
    // The radius grows with the ignition altitude on the demo study (the CLI test checks the same trend).
    expect(radii[2]).toBeGreaterThan(radii[0]);
    await screenshot(page, 'study-ignition-altitude');
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('study-export-csv').click()]);
    const lines = (await fs.readFile((await download.path())!, 'utf8')).trim().split('\n');
    expect(lines[1]).toBe('ignition_altitude_m,guaranteed_divert_radius_m,limited_by_grid,nominal_propellant_kg,reachable_area_m2');
    expect(lines.slice(2).map((l) => l.split(',')[0])).toEqual(['900', '1400', '1800']);
    expect(session.problems).toEqual([]);
  });

  it('runs a reserve study on a 5 × 5 footprint: area shrinks as the reserve grows; JSON report exports', async () => {
    const { page } = session;
    await page.getByTestId('grid-side').fill('5');
    await page.getByTestId('grid-half-width').fill('3000');
    await page.getByTestId('study-tab-reserve').click();
    await page.getByTestId('study-reserves').fill('0, 150, 300');
    await page.getByTestId('study-run').click();
    await page.waitForFunction(() => /25 \/ 25 targets in/.test(document.querySelector('[data-testid="study-progress"]')?.textContent ?? ''), null, { timeout: 45_000 });
    expect(await plotSeries()).toContain('Reachable area:3');
    const areas = (await page.getByTestId('study-table-reserve').locator('tbody tr td:nth-child(3)').allTextContents()).map(Number);
    expect(areas).toHaveLength(3);
    // {propellant ≤ usable − R} shrinks as R grows (nested sublevel sets): never larger.
    expect(areas[1]).toBeLessThanOrEqual(areas[0]);
    expect(areas[2]).toBeLessThanOrEqual(areas[1]);
    expect(areas[2]).toBeLessThan(areas[0]);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('study-export-json').click()]);
    const report = JSON.parse(await fs.readFile((await download.path())!, 'utf8'));
    expect(report).toMatchObject({ format: 'landreach-study-result', version: 1, study: 'reserve', cancelled: false, usablePropellant_kg: 500 });
    expect(report.caution).toMatch(/^Preliminary design and trade studies only/);
    expect(report.inputsHash).toMatch(/^[0-9a-f]{64}$/);
    expect(report.rows.map((r: { reserve_kg: number }) => r.reserve_kg)).toEqual([0, 150, 300]);
    // The ignition-altitude result is still there when its tab is shown again.
    await page.getByTestId('study-tab-ignition-altitude').click();
    expect(await page.getByTestId('study-table-ignition-altitude').locator('tbody tr').count()).toBe(3);
    await screenshot(page, 'study-reserve');
    expect(session.problems).toEqual([]);
  });

  it('runs a dispersion study: landing ellipse in the chart and on the terrain, probability-of-reach drape with its legend', async () => {
    const { page } = session;
    await page.getByTestId('study-tab-dispersion').click();
    await page.getByTestId('study-samples').fill('200');
    await page.getByTestId('study-reach-samples').fill('2');
    await page.getByTestId('study-run').click();
    await page.waitForFunction(() => /3 \/ 3 steps in/.test(document.querySelector('[data-testid="study-progress"]')?.textContent ?? ''), null, { timeout: 45_000 });
    const series = await plotSeries();
    expect(series).toContain('Landing points (200 samples):200');
    expect(series).toContain('99.7 % landing ellipse:97');
    const table = (await page.getByTestId('study-table-dispersion').textContent()) ?? '';
    expect(table).toMatch(/Semi-major axis\s*[\d.]+ m/);
    expect(table).toMatch(/Reach-map samples\s*2/);
    const markers = await page.evaluate(() => (document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { markerNames(): string[] } }).landreachScene.markerNames());
    expect(markers).toContain('landing-ellipse');
    expect(await page.getByTestId('ellipse-legend').textContent()).toMatch(/landing dispersion/);
    expect(await page.locator('.legend-title').textContent()).toBe('Probability of reach (%)');
    expect(await page.getByTestId('drape-note').textContent()).toMatch(/2 dispersed samples/);
    expect(await page.getByTestId('reach-legend').textContent()).toMatch(/0 %.*100 %/);
    await screenshot(page, 'study-dispersion');
    // Leaving the study's tab gives the scene back to the footprint view: no ellipse.
    await page.getByTestId('chart-tab-throttle').click();
    await page.waitForFunction(() => !(document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { markerNames(): string[] } }).landreachScene.markerNames().includes('landing-ellipse'));
    expect(session.problems).toEqual([]);
  });
});
