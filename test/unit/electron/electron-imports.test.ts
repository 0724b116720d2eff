import { describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import * as path from 'node:path';

// Electron's binary cannot be fetched on test machines, so only the two entry files may load
// 'electron' at run time; every other module must take Electron objects as parameters or import types.
const ELECTRON_DIR = path.resolve(import.meta.dirname, '../../../electron');
const RUNTIME_IMPORT = /^\s*import\s+(?!type\b)[^;]*from\s+['"]electron['"]|require\(\s*['"]electron['"]\s*\)/m;

describe('electron imports', () => {
  it('only main.ts and preload.cts import electron at run time', () => {
    const files = fs.readdirSync(ELECTRON_DIR).filter((f) => /\.(c?ts)$/.test(f));
    const importing = files.filter((f) => RUNTIME_IMPORT.test(fs.readFileSync(path.join(ELECTRON_DIR, f), 'utf8')));
    expect(importing.sort()).toEqual(['main.ts', 'preload.cts']);
  });
});
