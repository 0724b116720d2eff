import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import * as fs from 'node:fs/promises';
import * as os from 'node:os';
import * as path from 'node:path';
import { addRecent, parseRecent, RecentFiles, RECENT_LIMIT } from '../../../electron/recent-files.ts';
import { decodeRecovery, RecoveryStore } from '../../../electron/recovery.ts';
import { closeDecision } from '../../../electron/close-guard.ts';

let dir: string;
beforeEach(async () => {
  dir = await fs.mkdtemp(path.join(os.tmpdir(), 'landreach-rr-'));
});
afterEach(async () => {
  await fs.rm(dir, { recursive: true, force: true });
});

describe('recent files', () => {
  it('moves a reopened file to the front without duplicates and caps the list', () => {
    let list: string[] = [];
    for (let i = 0; i < RECENT_LIMIT + 3; i++) list = addRecent(list, `/s/${i}.json`);
    expect(list).toHaveLength(RECENT_LIMIT);
    expect(list[0]).toBe(`/s/${RECENT_LIMIT + 2}.json`);
    list = addRecent(list, '/s/5.json');
    expect(list[0]).toBe('/s/5.json');
    expect(list.filter((f) => f === '/s/5.json')).toHaveLength(1);
  });

  it('ignores a damaged store and non-absolute entries', () => {
    expect(parseRecent('{oops')).toEqual([]);
    expect(parseRecent(JSON.stringify({ files: ['/a.json', 'relative.json', 7, '/a.json'] }))).toEqual(['/a.json']);
  });

  it('persists across instances', async () => {
    const store = path.join(dir, 'nested', 'recent.json');
    await new RecentFiles(store).add('/x/one.landreach.json');
    const again = new RecentFiles(store);
    expect(await again.load()).toEqual(['/x/one.landreach.json']);
    expect(again.has('/x/one.landreach.json')).toBe(true);
  });
});

describe('crash recovery', () => {
  it('keeps the last autosaved text with its original path and time, and clears it', async () => {
    const store = new RecoveryStore(path.join(dir, 'rec', 'unsaved.json'), undefined, () => new Date('2026-01-02T03:04:05Z'));
    expect(await store.read()).toBeNull();
    await store.write('{"draft":1}', null);
    await store.write('{"draft":2}', '/s/site.landreach.json');
    expect(await store.read()).toEqual({ text: '{"draft":2}', originalPath: '/s/site.landreach.json', savedAt: '2026-01-02T03:04:05.000Z' });
    await store.clear();
    expect(await store.read()).toBeNull();
    await store.clear();
  });

  it('treats a damaged recovery file as absent', () => {
    expect(decodeRecovery('{"format":"landreach-recovery","text":5}')).toBeNull();
    expect(decodeRecovery('garbage')).toBeNull();
  });
});

describe('close guard', () => {
  it('closes a clean window, keeps a dirty one unless discard was clicked', () => {
    expect(closeDecision(false, null)).toBe('close');
    expect(closeDecision(true, 0)).toBe('stay');
    expect(closeDecision(true, null)).toBe('stay');
    expect(closeDecision(true, 1)).toBe('discard');
  });
});
