/**
 * Validation of IPC senders and arguments. The renderer is treated as untrusted input: a compromised
 * page must not be able to read or write arbitrary files through the bridge.
 */
import { EXPORT_KINDS, MAX_PAYLOAD_BYTES, type ExportKind, type ExportRequest } from './bridge-api.ts';
import { isAppOrigin } from './security.ts';

export class IpcValidationError extends Error {
  override readonly name = 'IpcValidationError';
}

/** The part of an IPC event used to check where it came from. */
export interface SenderInfo {
  senderFrame: { url: string; parent: unknown } | null;
}

/** Only the app's own top-level page may call the bridge. */
export function assertTrustedSender(event: SenderInfo, appUrl: string): void {
  const frame = event.senderFrame;
  if (!frame) throw new IpcValidationError('IPC refused: the sending frame is gone');
  if (frame.parent !== null) throw new IpcValidationError('IPC refused: sent from a sub-frame');
  if (!isAppOrigin(frame.url, appUrl)) throw new IpcValidationError(`IPC refused: sender ${frame.url} is not the app page`);
}

function byteLength(value: string | Uint8Array): number {
  return typeof value === 'string' ? new TextEncoder().encode(value).length : value.byteLength;
}

export function expectText(value: unknown, name: string, maxBytes = MAX_PAYLOAD_BYTES): string {
  if (typeof value !== 'string') throw new IpcValidationError(`invalid ${name}: expected a string, got ${typeof value}`);
  // A quick bound first (UTF-16 length ≤ UTF-8 bytes ≤ 3 × length) to avoid encoding huge strings.
  if (value.length > maxBytes || (value.length * 3 > maxBytes && byteLength(value) > maxBytes)) {
    throw new IpcValidationError(`invalid ${name}: larger than ${maxBytes} bytes`);
  }
  return value;
}

/** A file name proposed in a save dialog: a plain name, no folders, no control characters. */
export function expectFileName(value: unknown, name: string): string {
  const text = expectText(value, name, 255);
  // eslint-disable-next-line no-control-regex
  if (text.length === 0 || /[\\/\u0000-\u001f]/.test(text) || text === '.' || text === '..') {
    throw new IpcValidationError(`invalid ${name}: ${JSON.stringify(text)} (must be a plain file name without folders)`);
  }
  return text;
}

/** A request that takes no arguments must get none (a page passing a path here is refused, not ignored). */
export function expectNoArguments(args: unknown[], method: string): void {
  if (args.length > 0) throw new IpcValidationError(`invalid ${method} call: expected no arguments, got ${args.length}`);
}

export function expectExportRequest(value: unknown): ExportRequest {
  if (typeof value !== 'object' || value === null) throw new IpcValidationError('invalid export request: expected an object');
  const record = value as Record<string, unknown>;
  const kind = record.kind;
  if (typeof kind !== 'string' || !Object.hasOwn(EXPORT_KINDS, kind)) {
    throw new IpcValidationError(`invalid export kind: ${JSON.stringify(kind)} (one of ${Object.keys(EXPORT_KINDS).join(', ')})`);
  }
  const spec = EXPORT_KINDS[kind as ExportKind];
  const suggestedName = expectFileName(record.suggestedName, 'suggestedName');
  const data = record.data;
  if (spec.binary) {
    if (!(data instanceof Uint8Array)) throw new IpcValidationError(`invalid ${kind} export data: expected bytes`);
    if (data.byteLength > MAX_PAYLOAD_BYTES) throw new IpcValidationError(`invalid ${kind} export data: larger than ${MAX_PAYLOAD_BYTES} bytes`);
    // PNG signature (ISO/IEC 15948 §5.2): refuse bytes that are not what the kind says.
    const signature = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
    if (kind === 'png' && !signature.every((b, i) => data[i] === b)) throw new IpcValidationError('invalid png export data: missing PNG signature');
    // Little-endian TIFF header (TIFF 6.0 §2: "II", 42), as core/terrain's writer makes it.
    if (kind === 'tif' && !(data[0] === 0x49 && data[1] === 0x49 && data[2] === 42 && data[3] === 0)) throw new IpcValidationError('invalid tif export data: missing TIFF header');
  } else {
    expectText(data, `${kind} export data`);
  }
  return { kind: kind as ExportKind, suggestedName, data: data as string | Uint8Array };
}

export function expectDocumentState(value: unknown): { dirty: boolean; title: string } {
  const record = (typeof value === 'object' && value !== null ? value : {}) as Record<string, unknown>;
  if (typeof record.dirty !== 'boolean') throw new IpcValidationError('invalid document state: "dirty" must be a boolean');
  const title = expectText(record.title, 'document title', 512);
  return { dirty: record.dirty, title };
}
