/**
 * Study text from bytes: UTF-8, a leading byte-order mark dropped (editors on some systems write one),
 * anything else refused with the offset and line of the first byte that is not UTF-8 (a replacing
 * decoder would silently change a name). The same rule as core/study's decodeStudyBytes, which the CLI
 * and the renderer use; the main process cannot import core/ at run time (electron/tsconfig.json's
 * rootDir), so this is a copy, and test/unit/electron/text-decode.test.ts checks the two agree.
 */
export type DecodedText = { ok: true; text: string } | { ok: false; byte: number; line: number };

export function decodeUtf8Text(bytes: Uint8Array): DecodedText {
  try {
    // fatal: refuse, never replace; the default ignoreBOM: false drops a leading byte-order mark.
    return { ok: true, text: new TextDecoder('utf-8', { fatal: true }).decode(bytes) };
  } catch {
    const byte = firstInvalidUtf8(bytes);
    let line = 1;
    for (let i = 0; i < byte; i++) if (bytes[i] === 0x0a) line++;
    return { ok: false, byte, line };
  }
}

/** Offset of the first byte that is not part of valid UTF-8: the longest prefix a streaming decoder accepts. */
function firstInvalidUtf8(bytes: Uint8Array): number {
  const valid = (n: number) => {
    try {
      new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(0, n), { stream: true });
      return true;
    } catch {
      return false;
    }
  };
  // valid() is monotone in n (a prefix of a valid prefix is valid), so bisect for the last valid length.
  let lo = 0;
  let hi = bytes.length;
  while (lo < hi) {
    const mid = Math.ceil((lo + hi) / 2);
    if (valid(mid)) lo = mid;
    else hi = mid - 1;
  }
  // The decoder holds back an unfinished sequence: if one is pending at `lo`, it starts at its lead byte.
  let k = lo;
  while (k > 0 && lo - k < 3 && (bytes[k - 1] & 0xc0) === 0x80) k--;
  const lead = k > 0 ? bytes[k - 1] : 0;
  const length = lead >= 0xf0 ? 4 : lead >= 0xe0 ? 3 : lead >= 0xc0 ? 2 : 1;
  return length > lo - (k - 1) ? k - 1 : lo;
}
