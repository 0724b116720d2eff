/**
 * What every exported result carries: the caution, the app version, and a hash of the inputs that made it.
 * One source of truth for the caution text (CLI, exports, the about box).
 */

/** The caution printed on every report, export and about box. */
export const CAUTION =
  "Preliminary design and trade studies only; not flight software. Verify with high-fidelity simulation and your organisation's assurance process.";

/** The application version (kept equal to package.json's by a unit test). */
export const APP_VERSION = '0.1.0';

/** JSON with object keys sorted at every level, so equal inputs always hash the same. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(value, (_key, v) => {
    if (v && typeof v === 'object' && !Array.isArray(v) && !ArrayBuffer.isView(v)) {
      return Object.fromEntries(Object.keys(v).sort().map((k) => [k, (v as Record<string, unknown>)[k]]));
    }
    if (ArrayBuffer.isView(v)) return Array.from(v as unknown as ArrayLike<number>);
    return v;
  });
}

/** SHA-256 (FIPS 180-4, via Web Crypto) of the canonical JSON of the inputs, as lower-case hex. */
export async function inputsHash(inputs: unknown): Promise<string> {
  return sha256Hex(new TextEncoder().encode(canonicalJson(inputs)));
}

/** SHA-256 of bytes as lower-case hex (Web Crypto: browsers, workers and Node alike). */
export async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const digest = await globalThis.crypto.subtle.digest('SHA-256', bytes as BufferSource);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}
