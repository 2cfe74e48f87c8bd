/**
 * Which image files the side view traces over: PNG, JPEG and WebP, told by their first
 * bytes (a file's name or type may say otherwise), up to the path editor's size limit.
 * Pure: no DOM.
 */

export type TraceImageFormat = 'PNG' | 'JPEG' | 'WebP';

export const TRACE_IMAGE_FORMATS: readonly TraceImageFormat[] = ['PNG', 'JPEG', 'WebP'];
/** The first bytes needed to tell the formats apart. */
export const SIGNATURE_BYTES = 12;

const startsWith = (bytes: Uint8Array, at: number, sig: readonly number[]) => sig.every((b, i) => bytes[at + i] === b);
const ascii = (s: string) => [...s].map((c) => c.charCodeAt(0));

/** The format of a file from its first bytes, or what it looks like instead (in words). */
export function imageFormatOf(bytes: Uint8Array): { readonly ok: true; readonly format: TraceImageFormat } | { readonly ok: false; readonly seen: string } {
  // Signatures: PNG (ISO/IEC 15948), JPEG SOI marker (ITU-T T.81), WebP in a RIFF container.
  if (startsWith(bytes, 0, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return { ok: true, format: 'PNG' };
  if (startsWith(bytes, 0, [0xff, 0xd8, 0xff])) return { ok: true, format: 'JPEG' };
  if (startsWith(bytes, 0, ascii('RIFF')) && startsWith(bytes, 8, ascii('WEBP'))) return { ok: true, format: 'WebP' };
  if (startsWith(bytes, 0, ascii('GIF8'))) return { ok: false, seen: 'a GIF image' };
  if (startsWith(bytes, 0, ascii('BM'))) return { ok: false, seen: 'a BMP image' };
  const head = new TextDecoder().decode(bytes).trimStart().toLowerCase();
  if (head.startsWith('<svg') || head.startsWith('<?xml')) return { ok: false, seen: 'an SVG or XML file' };
  if (bytes.length === 0) return { ok: false, seen: 'an empty file' };
  return { ok: false, seen: 'not an image Loci can read' };
}

/** Why a file of this size and these first bytes is refused, or null when it may be loaded. */
export function traceFileProblem(sizeBytes: number, head: Uint8Array, maxBytes: number): string | null {
  if (sizeBytes > maxBytes) return `the file is ${(sizeBytes / 1e6).toFixed(1)} MB; an image may be at most ${maxBytes / 1e6} MB`;
  const kind = imageFormatOf(head);
  if (!kind.ok) return `the file is ${kind.seen}; expected ${TRACE_IMAGE_FORMATS.join(', ').replace(/, (?=[^,]*$)/, ' or ')}`;
  return null;
}
