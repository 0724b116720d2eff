/**
 * The core/ layer rule (eslint.config.js, DEVELOPERS.md "Import rules") catches an import that runs back up
 * a layer — in particular core/study (schema, load, units) importing the exporters or the footprint engine,
 * the cycle that core/export/ removed — and lets the allowed direction through.
 */
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

const eslint = new ESLint({ cwd: process.cwd() });

async function restricted(filePath: string, importPath: string): Promise<string[]> {
  const [result] = await eslint.lintText(`import { x } from '${importPath}';\nexport const y = x;\n`, { filePath });
  return result.messages.filter((m) => m.ruleId === 'no-restricted-imports').map((m) => m.message);
}

describe('core/ import layers (lint)', () => {
  it.each([
    ['core/study/probe.ts', '../footprint/field.ts'],
    ['core/study/probe.ts', '../export/footprintExport.ts'],
    ['core/footprint/probe.ts', '../export/footprintGeoJson.ts'],
    ['core/terrain/probe.ts', '../footprint/field.ts'],
    ['core/descent/probe.ts', '../study/schema.ts'],
    ['core/export/probe.ts', 'node:fs'],
  ])('%s may not import %s', async (file, target) => {
    expect(await restricted(file, target)).toHaveLength(1);
  }, 30_000);

  it.each([
    ['core/export/probe.ts', '../footprint/field.ts'],
    ['core/export/probe.ts', '../terrain/tiff-writer.ts'],
    ['core/footprint/probe.ts', '../study/schema.ts'],
    ['core/cli/probe.ts', '../export/footprintExport.ts'],
  ])('%s may import %s', async (file, target) => {
    expect(await restricted(file, target)).toEqual([]);
  }, 30_000);
});
