import { describe, expect, it } from 'vitest';
import * as fs from 'node:fs';
import * as vm from 'node:vm';
import ts from 'typescript';
import { INVOKE_CHANNELS, MENU_CHANNEL, type LandreachBridge } from '../../../electron/bridge-api.ts';

/**
 * Runs the real preload source against a fake Electron (the sandboxed preload only ever sees
 * contextBridge and ipcRenderer) and records what it exposes and which channels it invokes.
 */
function runPreload() {
  const source = fs.readFileSync(new URL('../../../electron/preload.cts', import.meta.url), 'utf8');
  const js = ts.transpileModule(source, { compilerOptions: { module: ts.ModuleKind.CommonJS, target: ts.ScriptTarget.ES2022 } }).outputText;
  const exposed: Record<string, unknown> = {};
  const invoked: { channel: string; args: unknown[] }[] = [];
  const listeners = new Map<string, ((...a: unknown[]) => void)[]>();
  const required: string[] = [];
  const electron = {
    contextBridge: { exposeInMainWorld: (key: string, api: unknown) => (exposed[key] = api) },
    ipcRenderer: {
      invoke: async (channel: string, ...args: unknown[]) => invoked.push({ channel, args }),
      on: (channel: string, l: (...a: unknown[]) => void) => listeners.set(channel, [...(listeners.get(channel) ?? []), l]),
      removeListener: (channel: string, l: (...a: unknown[]) => void) => listeners.set(channel, (listeners.get(channel) ?? []).filter((x) => x !== l)),
    },
  };
  const module = { exports: {} };
  const require = (name: string) => {
    required.push(name);
    if (name !== 'electron') throw new Error(`a sandboxed preload cannot require ${name}`);
    return electron;
  };
  vm.runInNewContext(js, { require, module, exports: module.exports, Object });
  return { exposed, invoked, listeners, required };
}

describe('preload bridge', () => {
  it('exposes exactly one frozen object, window.landreach, and requires only electron', () => {
    const { exposed, required } = runPreload();
    expect(Object.keys(exposed)).toEqual(['landreach']);
    expect(Object.isFrozen(exposed.landreach)).toBe(true);
    expect(required).toEqual(['electron']);
  });

  it('maps every named method to the channel the main process registers', async () => {
    const { exposed, invoked } = runPreload();
    const bridge = exposed.landreach as Record<string, (...a: unknown[]) => Promise<unknown>>;
    const methods = Object.keys(bridge).filter((k) => k !== 'onMenuCommand').sort();
    expect(methods).toEqual(Object.keys(INVOKE_CHANNELS).sort());
    for (const [method, channel] of Object.entries(INVOKE_CHANNELS)) {
      invoked.length = 0;
      await bridge[method]('a', 'b');
      expect(invoked, method).toEqual([{ channel, args: ['a', 'b'] }]);
    }
  });

  it('delivers menu commands without the IPC event, and unsubscribes', () => {
    const { exposed, listeners } = runPreload();
    const bridge = exposed.landreach as LandreachBridge;
    const got: unknown[] = [];
    const off = bridge.onMenuCommand((command, detail) => got.push([command, detail]));
    const fakeEvent = { sender: { secret: true } };
    listeners.get(MENU_CHANNEL)![0](fakeEvent, 'open-recent', { path: '/a/b.landreach.json', extra: 1 });
    listeners.get(MENU_CHANNEL)![0](fakeEvent, 'undo');
    expect(got).toEqual([['open-recent', { path: '/a/b.landreach.json' }], ['undo', {}]]);
    off();
    expect(listeners.get(MENU_CHANNEL)).toEqual([]);
  });
});
