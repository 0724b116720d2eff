import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { addPngText } from '../../renderer/export/png-metadata.ts';
import { tinyPng } from '../unit/renderer/export/tiny-png.ts';
import { REFERENCE_PYTHON, referenceToolsReady } from '../support/reference-tools.ts';

// Reference: Pillow (Debian python3-pil, pulled in by python3-matplotlib), an independent PNG decoder,
// must decode our PNG with its pixels intact and read back every iTXt entry.
describe.runIf(referenceToolsReady('pillow'))('PNG text metadata against Pillow', () => {
  it('decodes the image and reads the UTF-8 text entries', () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'landreach-png-'));
    try {
      const file = path.join(dir, 'figure.png');
      const entries = { Title: 'Cratère rim — trade A', Disclaimer: 'Preliminary design only', 'Creation Time': '2026-03-04T05:06:07Z' };
      fs.writeFileSync(file, addPngText(tinyPng(4, 3, [200, 100, 50, 255]), entries));
      const script = [
        'import json, sys',
        'from PIL import Image',
        'im = Image.open(sys.argv[1]); im.load()',
        'print(json.dumps({"size": im.size, "mode": im.mode, "pixel": im.getpixel((3, 2)), "text": dict(im.text)}))',
      ].join('\n');
      const out = JSON.parse(execFileSync(REFERENCE_PYTHON, ['-c', script, file], { encoding: 'utf8' }));
      expect(out).toEqual({ size: [4, 3], mode: 'RGBA', pixel: [200, 100, 50, 255], text: entries });
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
