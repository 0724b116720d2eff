/** Headless Debian Chromium for the e2e tests (flags from shared STACK-NOTES.md). */
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import * as fs from 'node:fs/promises';
import * as os from 'node:os';
import * as path from 'node:path';
import { REFERENCE_CHROMIUM } from '../support/reference-tools.ts';

export const ARTIFACTS = path.resolve(import.meta.dirname, '../../test-artifacts');

export interface Session {
  context: BrowserContext;
  page: Page;
  /** Console errors, page errors and CSP violations seen so far. */
  problems: string[];
  close(): Promise<void>;
}

export async function openSession(url: string): Promise<Session> {
  const profile = await fs.mkdtemp(path.join(os.tmpdir(), 'landreach-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: REFERENCE_CHROMIUM,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    viewport: { width: 1400, height: 860 },
    acceptDownloads: true,
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const problems: string[] = [];
  page.on('console', (message) => {
    // SwiftShader's read-back notice is expected (STACK-NOTES.md); everything else at error level is a problem.
    if (message.type() === 'error' && !/GPU stall due to ReadPixels/.test(message.text())) problems.push(`console: ${message.text()}`);
  });
  page.on('pageerror', (error) => problems.push(`page error: ${error.message}`));
  await page.addInitScript(
    'document.addEventListener("securitypolicyviolation", (e) => console.error("CSP violation: " + e.violatedDirective + " " + e.blockedURI));',
  );
  await page.goto(url);
  await fs.mkdir(ARTIFACTS, { recursive: true });
  return {
    context,
    page,
    problems,
    async close() {
      await context.close();
      await fs.rm(profile, { recursive: true, force: true });
    },
  };
}

export async function screenshot(page: Page, name: string): Promise<string> {
  const file = path.join(ARTIFACTS, `${name}.png`);
  await page.screenshot({ path: file });
  return file;
}
