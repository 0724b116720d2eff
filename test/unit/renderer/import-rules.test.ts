import { describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import * as path from 'node:path';

// DEVELOPERS.md import rules: renderer/ may use electron/ for types only (the bridge contract), and
// only bridge.ts may touch window.landreach.
const RENDERER = path.resolve(import.meta.dirname, '../../../renderer');

function sources(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const full = path.join(dir, e.name);
    if (e.isDirectory()) return e.name === 'public' ? [] : sources(full);
    return /\.(ts|svelte)$/.test(e.name) && !e.name.endsWith('.d.ts') ? [full] : [];
  });
}

describe('renderer import rules', () => {
  const files = sources(RENDERER);

  it('imports electron/ for types only', () => {
    const offenders = files.filter((f) => {
      const text = fs.readFileSync(f, 'utf8');
      const imports = [...text.matchAll(/^\s*(import|export)\s+(type\s+)?[^;]*?from\s+['"]([^'"]+)['"]/gm)];
      return imports.some((m) => m[3].includes('/electron/') && !m[2]);
    });
    expect(offenders.map((f) => path.relative(RENDERER, f))).toEqual([]);
    expect(files.length).toBeGreaterThan(20);
  });

  it('touches window.landreach only in bridge.ts', () => {
    const touching = files.filter((f) => /window\.landreach/.test(fs.readFileSync(f, 'utf8')));
    expect(touching.map((f) => path.relative(RENDERER, f))).toEqual(['bridge.ts']);
  });
});
