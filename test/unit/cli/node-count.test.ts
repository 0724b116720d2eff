/**
 * Node counts at the command line: a count outside 5 … 2000 is refused with the range (it once ran 5 nodes
 * silently for `--nodes 3`), and a study at the top of the range keeps its result when the finer
 * discretisation check cannot go beyond the limit (it once threw the main result away).
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { main } from '../../../core/cli/main.ts';
import { captureIo } from '../../support/cli-io.ts';

const DEMO = fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url));

describe('footprint --nodes', () => {
  for (const bad of ['3', '2001', '4.5']) {
    it(`--nodes ${bad} is a usage error naming the range`, async () => {
      const c = captureIo();
      const code = await main(['footprint', DEMO, '--out', '/nonexistent-never-written', '--nodes', bad], c.io);
      expect(code).toBe(2);
      expect(c.err.join('')).toMatch(new RegExp(`--nodes ${bad.replace('.', '\\.')}: must be a whole number from 5 to 2000`));
    });
  }
});

describe('trajectory with 1,001 nodes', () => {
  it('solves and reports the check at the 2,000-node limit instead of failing', async () => {
    const study = JSON.parse(readFileSync(DEMO, 'utf8'));
    study.discretisation.nodes = 1001;
    const dir = mkdtempSync(join(tmpdir(), 'landreach-nodes-'));
    const path = join(dir, 'nodes-1001.study.json');
    writeFileSync(path, JSON.stringify(study));
    try {
      const c = captureIo();
      const code = await main(['trajectory', path], c.io);
      const out = c.out.join('');
      expect(code).toBe(0);
      expect(out).toMatch(/status\s+solved/);
      expect(out).toMatch(/with 2000 nodes/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 240_000);
});
