/**
 * The one content security policy the built page must carry, written out here on its own (not read from
 * renderer/csp.ts) so that any change to the policy is a deliberate change to this file too. Each
 * directive and why (the secure-Electron baseline of STYLE.md: default-src 'self', worker-src 'self',
 * object-src 'none'; the rest closes what default-src does not cover or what the app never needs):
 */
export const EXPECTED_PRODUCTION_CSP = [
  "default-src 'self'", // anything not listed below: our own origin only
  "script-src 'self'", // bundled scripts only: no inline, no eval, no other origin
  "style-src 'self'", // the built stylesheet only (no inline styles in the build)
  "img-src 'self' blob:", // figure previews are blob: URLs made from canvas snapshots; no data:
  "font-src 'self'",
  "connect-src 'self'", // the app reads its own bundled assets only
  "worker-src 'self'", // the solver's Web Workers, bundled
  "object-src 'none'", // no plugins
  "base-uri 'none'", // no <base> to redirect relative URLs
  "form-action 'none'", // the app submits no forms
  "frame-src 'none'", // no embedded frames
].join('; ');

/** The dev server (`npm run web`) differs only where Vite's hot reload needs it: inline styles, its websocket. */
export const EXPECTED_DEV_SERVER_CSP = EXPECTED_PRODUCTION_CSP
  .replace("style-src 'self'", "style-src 'self' 'unsafe-inline'")
  .replace("connect-src 'self'", "connect-src 'self' ws://127.0.0.1:*");
