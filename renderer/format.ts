/**
 * Numbers as the app shows them: one style everywhere. Negative values carry the true minus sign U+2212
 * (ISO 80000-1 and typeset mathematics; the hyphen-minus is a typewriter stand-in), and a value that rounds
 * to zero shows no sign at all ("0.0", not "−0.0").
 */
export const MINUS = '\u2212';

/** `v` to `digits` decimals with a true minus sign; an em dash for a value that is not finite. */
export function fixed(v: number, digits: number): string {
  if (!Number.isFinite(v)) return '—';
  const text = v.toFixed(digits);
  if (Number(text) === 0) return text.replace('-', '');
  return text.replace('-', MINUS);
}

/** `v` with up to `digits` decimals, trailing zeros dropped (1.5, not 1.500), with a true minus sign. */
export function trimmed(v: number, digits: number): string {
  if (!Number.isFinite(v)) return '—';
  const n = Number(v.toFixed(digits));
  return n === 0 ? '0' : String(n).replace('-', MINUS);
}
