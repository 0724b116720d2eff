/**
 * The content security policies the main process sends as response headers on app://. The renderer's
 * renderer/csp.ts is the single source (PRODUCTION_CSP for the page, WORKER_CSP for worker scripts);
 * electron/ cannot import renderer/ (import rules, and electron/tsconfig.json's rootDir), so these are
 * copies, and test/unit/electron/app-protocol.test.ts requires them to be equal, character for character.
 */
export const APP_PAGE_CSP = [
  "default-src 'self'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "worker-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-src 'none'",
].join('; ');

export const APP_WORKER_CSP = APP_PAGE_CSP.replace("script-src 'self'", "script-src 'self' 'wasm-unsafe-eval'").replace("connect-src 'self'", "connect-src 'self' data:");
