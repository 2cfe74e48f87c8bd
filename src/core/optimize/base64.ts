/**
 * Doubles as base64 text (RFC 4648, with padding) of their IEEE 754 binary64 bytes,
 * little-endian: exact for every double (−0, subnormals, ±Infinity and NaN included),
 * 10⅔ characters a number against up to 24 for the shortest decimal that round-trips.
 */

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
const PAD = 61; // '='
const CODES = Uint8Array.from(ALPHABET, (c) => c.charCodeAt(0));
/** Byte → 6-bit value, 255 for a byte outside the alphabet. */
const VALUES = (() => {
  const table = new Uint8Array(256).fill(255);
  for (let k = 0; k < 64; k++) table[CODES[k]] = k;
  return table;
})();
/** The text of the ASCII codes written: a native decoder, many times faster than building the string in script. */
const ASCII = new TextDecoder();
const UTF8 = new TextEncoder();
const BYTES_PER_DOUBLE = 8;

/** The base64 text of `bytes`. */
export function bytesToBase64(bytes: Uint8Array): string {
  const n = bytes.length;
  const out = new Uint8Array(Math.ceil(n / 3) * 4);
  let o = 0;
  let i = 0;
  for (; i + 2 < n; i += 3) {
    const t = (bytes[i] << 16) | (bytes[i + 1] << 8) | bytes[i + 2];
    out[o++] = CODES[t >>> 18];
    out[o++] = CODES[(t >>> 12) & 63];
    out[o++] = CODES[(t >>> 6) & 63];
    out[o++] = CODES[t & 63];
  }
  if (i < n) {
    const t = (bytes[i] << 16) | (i + 1 < n ? bytes[i + 1] << 8 : 0);
    out[o++] = CODES[t >>> 18];
    out[o++] = CODES[(t >>> 12) & 63];
    out[o] = i + 1 < n ? CODES[(t >>> 6) & 63] : PAD;
    out[o + 1] = PAD;
  }
  return ASCII.decode(out);
}

/** The bytes of base64 `text`, or a message saying what is wrong with it. */
export function base64ToBytes(text: string): Uint8Array | string {
  if (text.length % 4 !== 0) return `base64 text of ${text.length} characters; expected a multiple of 4`;
  // Native: one byte a character for ASCII text; more bytes than characters means another character.
  const codes = UTF8.encode(text);
  const bad = (at: number) => `base64 text has ${JSON.stringify(text[at])} at ${at}; expected A–Z, a–z, 0–9, + or / (= only at the end)`;
  if (codes.length !== text.length) {
    for (let at = 0; at < text.length; at++) if (text.charCodeAt(at) >= 128) return bad(at);
  }
  const padding = text.endsWith('==') ? 2 : text.endsWith('=') ? 1 : 0;
  const n = (codes.length / 4) * 3 - padding;
  const out = new Uint8Array(n);
  const body = padding === 0 ? codes.length : codes.length - 4;
  let o = 0;
  for (let i = 0; i < body; i += 4) {
    const a = VALUES[codes[i]];
    const b = VALUES[codes[i + 1]];
    const c = VALUES[codes[i + 2]];
    const d = VALUES[codes[i + 3]];
    if ((a | b | c | d) > 63) {
      for (let k = i; k < i + 4; k++) if (VALUES[codes[k]] > 63) return bad(k);
    }
    const t = (a << 18) | (b << 12) | (c << 6) | d;
    out[o++] = t >>> 16;
    out[o++] = (t >>> 8) & 255;
    out[o++] = t & 255;
  }
  if (padding > 0) {
    const i = body;
    const a = VALUES[codes[i]];
    const b = VALUES[codes[i + 1]];
    const c = padding === 2 ? 0 : VALUES[codes[i + 2]];
    for (const [k, v] of [a, b, c].entries()) if (v > 63) return bad(i + k);
    const t = (a << 18) | (b << 12) | (c << 6);
    out[o] = t >>> 16;
    if (padding === 1) out[o + 1] = (t >>> 8) & 255;
  }
  return out;
}

/** Whether this platform stores doubles little-endian, so a Float64Array's bytes are the ones written. */
const LITTLE_ENDIAN = new Uint8Array(Float64Array.of(-0).buffer)[7] === 0x80;

/** The base64 text of the doubles, little-endian. */
export function float64ToBase64(doubles: Float64Array): string {
  if (LITTLE_ENDIAN) return bytesToBase64(new Uint8Array(doubles.buffer, doubles.byteOffset, doubles.byteLength));
  return doublesToBase64(doubles.length, (k) => doubles[k]);
}

/** The base64 text of `count` doubles taken from `get(k)`, little-endian. */
export function doublesToBase64(count: number, get: (k: number) => number): string {
  const bytes = new Uint8Array(count * BYTES_PER_DOUBLE);
  const view = new DataView(bytes.buffer);
  for (let k = 0; k < count; k++) view.setFloat64(k * BYTES_PER_DOUBLE, get(k), true);
  return bytesToBase64(bytes);
}

/** The doubles of base64 `text`, or a message saying what is wrong with it. */
export function base64ToDoubles(text: string): Float64Array | string {
  const bytes = base64ToBytes(text);
  if (typeof bytes === 'string') return bytes;
  if (bytes.length % BYTES_PER_DOUBLE !== 0) return `base64 text of ${bytes.length} bytes; expected a multiple of ${BYTES_PER_DOUBLE} (doubles)`;
  const view = new DataView(bytes.buffer);
  const out = new Float64Array(bytes.length / BYTES_PER_DOUBLE);
  for (let k = 0; k < out.length; k++) out[k] = view.getFloat64(k * BYTES_PER_DOUBLE, true);
  return out;
}
