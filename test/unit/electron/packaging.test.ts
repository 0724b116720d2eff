/**
 * Electron fuses in the packaging configuration, read and validated by electron-builder itself (its own
 * config loader and JSON-Schema validation, app-builder-lib 26) and turned into the fuse wire by the
 * packager's own generateFuseConfig, checked against @electron/fuses' option indices. Which fuses and
 * why: Electron's security checklist and fuses guide (electron/docs/tutorial/fuses.md, as quoted in
 * electron-builder's FuseOptionsV1 documentation).
 */
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { getConfig, validateConfiguration } from 'app-builder-lib/out/util/config/config.js';
import { LinuxPackager, type Configuration } from 'electron-builder';
import { FuseV1Options, FuseVersion } from '@electron/fuses';

const root = fileURLToPath(new URL('../../../', import.meta.url));

async function packagingConfig(): Promise<Configuration> {
  const config = await getConfig(root, 'electron-builder.yml', null);
  // Throws with the schema's message on an unknown key or a wrong type.
  await validateConfiguration(config, { isEnabled: false, add: () => undefined } as unknown as Parameters<typeof validateConfiguration>[1]);
  return config;
}

describe('packaging configuration (electron-builder.yml)', () => {
  it('is valid for electron-builder', async () => {
    await expect(packagingConfig()).resolves.toBeDefined();
  });

  it('flips the fuses: no run-as-node, no NODE_OPTIONS, no inspector, ASAR integrity on and only the app from the ASAR', async () => {
    const config = await packagingConfig();
    expect(config.electronFuses).toBeTruthy();
    const generate = (LinuxPackager.prototype as unknown as { generateFuseConfig(f: unknown): Promise<Record<string | number, unknown>> }).generateFuseConfig;
    const wire = await generate.call(null, config.electronFuses);
    expect(wire.version).toBe(FuseVersion.V1);
    expect(wire[FuseV1Options.RunAsNode]).toBe(false);
    expect(wire[FuseV1Options.EnableNodeOptionsEnvironmentVariable]).toBe(false);
    expect(wire[FuseV1Options.EnableNodeCliInspectArguments]).toBe(false);
    expect(wire[FuseV1Options.EnableEmbeddedAsarIntegrityValidation]).toBe(true);
    // Integrity means something only if code cannot be loaded from outside the checked archive.
    expect(wire[FuseV1Options.OnlyLoadAppFromAsar]).toBe(true);
    // The page is served from app://, never file://.
    expect(wire[FuseV1Options.GrantFileProtocolExtraPrivileges]).toBe(false);
  });

  it('packs the app into an ASAR archive (what the integrity fuse checks; electron-builder 26 always embeds its hash)', async () => {
    const config = await packagingConfig();
    expect(config.asar).not.toBe(false);
  });
});
