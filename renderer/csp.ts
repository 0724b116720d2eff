/**
 * The renderer's content security policy. The built page (loaded by Electron and by the browser
 * tests) carries exactly PRODUCTION_CSP in a <meta> tag; nothing inline, nothing evaluated.
 * test/unit/renderer/csp.test.ts and the e2e suite check it.
 */
export const PRODUCTION_CSP = [
  "default-src 'self'",
  "script-src 'self'",
  "style-src 'self'",
  // blob: for figure previews made from canvas snapshots; no data: (Vite is told not to inline assets).
  "img-src 'self' blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "worker-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-src 'none'",
].join('; ');

/**
 * The policy of the app's worker scripts. A worker takes no policy from the page's <meta>; in the desktop
 * app every app:// response carries a policy header (electron/app-protocol.ts), so workers get this one:
 * the page's, plus WebAssembly compilation ('wasm-unsafe-eval' allows compiling WebAssembly and nothing
 * else — no eval of JavaScript), which the solver's kernels need and the page itself does not; and `data:`
 * for connect, because the ZSTD decoder (zstddec, libzstd in WebAssembly) fetches its embedded module from a
 * data: URL — a data: URL carries its content inline and reaches no server, so it opens no way out.
 */
export const WORKER_CSP = PRODUCTION_CSP.replace("script-src 'self'", "script-src 'self' 'wasm-unsafe-eval'").replace("connect-src 'self'", "connect-src 'self' data:");

/**
 * The dev server injects component styles as <style> elements for hot reload, which a strict
 * style-src refuses; `npm run web` therefore relaxes style-src only. Builds never use this.
 */
export const DEV_SERVER_CSP = PRODUCTION_CSP.replace("style-src 'self'", "style-src 'self' 'unsafe-inline'").replace(
  "connect-src 'self'",
  "connect-src 'self' ws://127.0.0.1:*",
);

/**
 * Insert the CSP meta right after the charset declaration (or first in <head>): it must precede
 * every script and style to govern them.
 */
export function injectCsp(html: string, policy: string): string {
  if (/http-equiv=["']Content-Security-Policy["']/i.test(html)) throw new Error('index.html already has a CSP meta; the build adds it');
  const meta = `<meta http-equiv="Content-Security-Policy" content="${policy}" />`;
  const charset = /<meta charset=[^>]*>/i;
  const out = charset.test(html) ? html.replace(charset, (m) => `${m}\n    ${meta}`) : html.replace(/<head>/i, `<head>\n    ${meta}`);
  if (out === html) throw new Error('index.html has no <head> to put the CSP meta in');
  return out;
}
