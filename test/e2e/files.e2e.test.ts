import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import * as fs from 'node:fs/promises';
import * as os from 'node:os';
import * as path from 'node:path';
import { openSession, screenshot, type Session } from './browser.ts';
import { referenceToolsReady } from '../support/reference-tools.ts';

let session: Session;
// Debian chromium: a CI run fails without it (test/support/reference-tools.ts).
const browser = referenceToolsReady('chromium');
let dir: string;

beforeAll(async () => {
  if (!browser) return;
  session = await openSession(inject('baseUrl'));
  dir = await fs.mkdtemp(path.join(os.tmpdir(), 'landreach-e2e-'));
});
afterAll(async () => {
  await session?.close();
  if (dir) await fs.rm(dir, { recursive: true, force: true });
});

const input = (id: string) => session.page.locator(`[data-field="${id}"] input`);

describe.runIf(browser)('files in the browser fallback', () => {
  it('opens a study through the file input', async () => {
    const { page } = session;
    const file = path.join(dir, 'ridge.landreach.json');
    const study = { format: 'landreach-study', version: 1, name: 'Ridge (invented)', vehicle: { isp_s: 305, thrustPerEngine_N: 21000 } };
    await fs.writeFile(file, JSON.stringify(study));
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
    await chooser.setFiles(file);
    await page.waitForFunction(() => (document.querySelector('[data-testid="study-name"]') as HTMLInputElement).value === 'Ridge (invented)');
    expect(await input('vehicle.isp_s').inputValue()).toBe('305');
    expect(await input('vehicle.thrustPerEngine_N').inputValue()).toBe('21000');
    // The file lacked most inputs: the user is told defaults were filled in.
    expect(await page.getByTestId('notice').first().textContent()).toMatch(/ridge\.landreach\.json lacked 13 inputs \(Planet and site › Surface gravity, .* and 10 more\)/);
    expect(await page.locator('[data-field="vehicle.wetMass_kg"] .message').textContent()).toMatch(/Not in the opened file: the default 2100 kg was filled in/);
    await screenshot(page, 'opened-study');
  });

  it('refuses a newer-version study with a message and keeps the current one', async () => {
    const { page } = session;
    const file = path.join(dir, 'future.landreach.json');
    await fs.writeFile(file, JSON.stringify({ format: 'landreach-study', version: 99, vehicle: { isp_s: 111 } }));
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
    await chooser.setFiles(file);
    await page.getByText(/future\.landreach\.json was not opened: Study version 99/).waitFor();
    expect(await input('vehicle.isp_s').inputValue()).toBe('305');
  });

  it('keeps unsaved edits across a reload through the crash-recovery copy', async () => {
    const { page } = session;
    await input('vehicle.isp_s').fill('not a number yet');
    // Autosave runs every few seconds while there are unsaved changes.
    await page.waitForFunction(() => (localStorage.getItem('landreach.recovery') ?? '').includes('not a number yet'), undefined, { timeout: 15_000 });
    page.once('dialog', (dialog) => void dialog.accept());
    await page.reload();
    const banner = page.getByTestId('recovery-banner');
    await banner.waitFor();
    await screenshot(page, 'recovery-banner');
    await banner.getByRole('button', { name: 'Restore it' }).click();
    expect(await input('vehicle.isp_s').inputValue()).toBe('not a number yet');
    expect(await page.locator('[data-field="vehicle.isp_s"] .message').textContent()).toMatch(/“not a number yet” is not a number/);
    expect(await page.getByTestId('file-state').textContent()).toMatch(/edited/);
    expect(session.problems).toEqual([]);
  });

  it('asks before discarding unsaved changes, and keeps them unless discard is chosen', async () => {
    const { page } = session;
    expect(await input('vehicle.isp_s').inputValue()).toBe('not a number yet');
    const dialog = page.getByTestId('confirm-dialog');
    await page.getByRole('button', { name: 'New', exact: true }).click();
    await dialog.waitFor({ state: 'visible' });
    expect(await dialog.textContent()).toMatch(/unsaved changes\. Discard them to start a new study\?/);
    await screenshot(page, 'confirm-discard');
    await dialog.getByRole('button', { name: 'Keep working' }).click();
    await dialog.waitFor({ state: 'hidden' });
    expect(await input('vehicle.isp_s').inputValue()).toBe('not a number yet');
    await page.getByRole('button', { name: 'New', exact: true }).click();
    await dialog.getByRole('button', { name: 'Discard changes' }).click();
    await page.waitForFunction(() => (document.querySelector('[data-field="vehicle.isp_s"] input') as HTMLInputElement).value === '230');
    expect(await page.evaluate(() => localStorage.getItem('landreach.recovery'))).toBeNull();
  });
});
