import { defineConfig, type Plugin } from 'vite';
import { svelte } from '@sveltejs/vite-plugin-svelte';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { DEV_SERVER_CSP, PRODUCTION_CSP, injectCsp } from './csp.ts';

const root = fileURLToPath(new URL('.', import.meta.url));
const pkg = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string };

function contentSecurityPolicy(): Plugin {
  let policy = PRODUCTION_CSP;
  return {
    name: 'landreach-csp',
    configResolved(config) {
      policy = config.command === 'serve' && !config.isProduction ? DEV_SERVER_CSP : PRODUCTION_CSP;
    },
    transformIndexHtml: { order: 'pre', handler: (html) => injectCsp(html, policy) },
  };
}

export default defineConfig({
  root,
  // Relative asset URLs so the same build loads from file:// in Electron and from http in a browser.
  base: './',
  plugins: [svelte(), contentSecurityPolicy()],
  define: { __APP_VERSION__: JSON.stringify(pkg.version) },
  worker: { format: 'es' },
  build: {
    outDir: fileURLToPath(new URL('../dist', import.meta.url)),
    emptyOutDir: true,
    // Inlined assets become data: URLs, which the CSP does not allow.
    assetsInlineLimit: 0,
    target: 'es2022',
    chunkSizeWarningLimit: 1500,
    sourcemap: true,
  },
  server: { host: '127.0.0.1', strictPort: false },
  preview: { host: '127.0.0.1' },
});
