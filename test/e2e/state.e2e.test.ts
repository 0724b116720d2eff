/**
 * The workspace as one state, in Chromium on the invented demo study: every result knows the inputs it was
 * computed from (picks and studies go stale when they change), every input group blocks a run while it has an
 * error, one undo history covers every input and says what each step changed, and a study's progress stays on
 * its own tab. Each check is of behaviour the issue names; no figure here comes from our own output.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
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

const input = (id: string) => session.page.locator(`[data-field="${id}"] input`);
const blur = () => session.page.evaluate('document.activeElement && document.activeElement.blur()');
const closeNotices = async () => {
  const { page } = session;
  await page.evaluate('document.querySelectorAll(\'[data-testid="notice"] button\').forEach((b) => b.click())');
  await page.waitForFunction(() => document.querySelectorAll('[data-testid="notice"]').length === 0);
};

/** A fresh page with the demo study open (each bug's test starts from the same state). */
async function openDemo(): Promise<void> {
  const { page } = session;
  await page.reload();
  await page.getByTestId('status-ok').waitFor();
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
  await chooser.setFiles(DEMO_STUDY.pathname);
  await page.waitForFunction(() => (document.querySelector('[data-testid="study-name"]') as HTMLInputElement).value.startsWith('Demo: invented lander'));
  await page.getByTestId('scene-canvas').waitFor();
  await closeNotices();
}

describe.runIf(browser)('the workspace as one state (demo study)', () => {
  it('opens the demo study', openDemo);

  // Bug 5 of issue 15: Ctrl+Z after a grid edit took back an earlier study edit the user could not see.
  it('Ctrl+Z after a grid edit takes back the grid edit, not an earlier study input, and says what it undid', async () => {
    const { page } = session;
    const throttle = input('vehicle.throttleMin');
    const before = await throttle.inputValue();
    const side = await page.getByTestId('grid-side').inputValue();
    await throttle.fill('0.3');
    await blur();
    await page.getByTestId('grid-side').fill('9');
    await blur();
    await page.keyboard.press('Control+z');
    expect(await page.getByTestId('grid-side').inputValue()).toBe(side);
    expect(await throttle.inputValue()).toBe('0.3');
    const notice = (await page.getByTestId('notice').last().textContent()) ?? '';
    expect(notice).toContain(`Grid › Targets per side 9 → ${side}`);
    await page.keyboard.press('Control+z');
    expect(await throttle.inputValue()).toBe(before);
    expect((await page.getByTestId('notice').last().textContent()) ?? '').toMatch(/Minimum throttle|throttle/i);
    await closeNotices();
  });

  // Bug 3 of issue 15: an error in the Terrain group was shown there but blocked nothing.
  it('a terrain-group error is counted in the status bar and blocks Compute', async () => {
    const { page } = session;
    await openDemo();
    const slope = page.locator('[data-terrain-field="maxSlope_deg"] input');
    const was = await slope.inputValue();
    await slope.fill('abc');
    await page.getByTestId('terrain-problem-maxSlope_deg').waitFor();
    expect(await page.getByTestId('status-problems').textContent()).toMatch(/1 input needs fixing/);
    expect(await page.getByTestId('compute').isDisabled()).toBe(true);
    await slope.fill(was);
    await blur();
    await page.getByTestId('status-ok').waitFor();
    expect(await page.getByTestId('compute').isDisabled()).toBe(false);
  });

  // Bug 1 of issue 15: a pick kept its "within the … budget" verdict against inputs it was not solved with.
  it('a picked trajectory goes stale when the vehicle changes: no budget verdict against the new inputs', async () => {
    const { page } = session;
    await openDemo();
    const point = await page.evaluate(() => {
      const canvas = document.querySelector('[data-testid="scene-canvas"]') as HTMLCanvasElement & { landreachScene: { projectGroundPoint(e: number, n: number): { x: number; y: number } | null } };
      const p = canvas.landreachScene.projectGroundPoint(500, -300);
      const box = canvas.getBoundingClientRect();
      return p ? { x: box.left + p.x, y: box.top + p.y } : null;
    });
    expect(point).not.toBeNull();
    await page.mouse.click(point!.x, point!.y);
    await page.getByTestId('trajectory-summary').waitFor({ timeout: 60_000 });
    expect(await page.getByTestId('trajectory-summary').textContent()).toMatch(/(within|ABOVE) the [\d.]+ kg budget/);
    expect(await page.getByTestId('trajectory-stale').count()).toBe(0);
    // A dry mass above the wet mass: the inputs are not a study at all, the pick was solved with others.
    const wet = Number(await input('vehicle.wetMass_kg').inputValue());
    await input('vehicle.dryMass_kg').fill(String(wet + 420));
    await blur();
    await page.getByTestId('trajectory-stale').waitFor();
    const text = (await page.getByTestId('results').textContent()) ?? '';
    expect(text).not.toMatch(/budget/);
    expect(text).not.toMatch(/[−-]\d[\d.]* kg budget/);
    await screenshot(page, 'state-pick-stale');
    // Undo gives the inputs it was solved with back: current again, with its verdict.
    await page.keyboard.press('Control+z');
    await page.getByTestId('trajectory-stale').waitFor({ state: 'detached' });
    expect(await page.getByTestId('trajectory-summary').textContent()).toMatch(/(within|ABOVE) the [\d.]+ kg budget/);
    await closeNotices();
  });

  // Bug 2 of issue 15: a study's own input typed after its run kept the old verdict as if current.
  it('a study result goes stale when the study\'s own inputs change', async () => {
    const { page } = session;
    await openDemo();
    await page.getByTestId('study-tab-ignition-altitude').click();
    await page.getByTestId('study-altitudes').fill('900, 1800');
    await page.getByTestId('study-directions').fill('6');
    await page.getByTestId('study-run').click();
    await page.waitForFunction(() => /2 \/ 2 altitudes in/.test(document.querySelector('[data-testid="study-progress"]')?.textContent ?? ''), null, { timeout: 60_000 });
    await page.getByTestId('study-table-ignition-altitude').waitFor();
    expect(await page.getByTestId('study-stale').count()).toBe(0);
    await page.getByTestId('study-required-radius').fill('900');
    await page.getByTestId('study-stale').waitFor();
    await page.getByTestId('study-required-radius').fill('');
    await page.getByTestId('study-stale').waitFor({ state: 'detached' });
  });

  // Bug 4 of issue 15: one study's progress bar showed on another study's tab.
  it('a study\'s progress shows on its own tab only', async () => {
    const { page } = session;
    expect(await page.getByTestId('study-progress').count()).toBe(1);
    await page.getByTestId('study-tab-reserve').click();
    expect(await page.getByTestId('study-progress').count()).toBe(0);
    await page.getByTestId('study-tab-ignition-altitude').click();
    expect(await page.getByTestId('study-progress').textContent()).toMatch(/2 \/ 2 altitudes in/);
    expect(session.problems).toEqual([]);
  });
});
