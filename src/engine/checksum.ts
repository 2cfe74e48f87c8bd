/**
 * A 64-bit checksum of a text, to detect a corrupt checkpoint (a truncated write, a bit
 * flip, a hand edit). Not a cryptographic hash: it guards against accidents only.
 */

const FNV64_OFFSET_HI = 0xcbf29ce4;
const FNV64_OFFSET_LO = 0x84222325;
/** The 64-bit FNV prime is 2^40 + 0x1b3. */
const FNV64_PRIME_LO = 0x1b3;
const TWO_POW_32 = 0x1_0000_0000;

const encoder = new TextEncoder();

/**
 * FNV-1a, 64 bit, over the UTF-8 bytes of `text`, as 16 lowercase hex digits.
 * Fowler, Noll and Vo, "The FNV Non-Cryptographic Hash Algorithm" (IETF draft-eastlake-fnv).
 * The 64-bit product is carried in two 32-bit halves so every step stays exact in a double.
 */
export function fnv1a64Hex(text: string): string {
  const bytes = encoder.encode(text);
  let hi = FNV64_OFFSET_HI;
  let lo = FNV64_OFFSET_LO;
  for (let i = 0; i < bytes.length; i++) {
    lo = (lo ^ bytes[i]) >>> 0;
    // h * (2^40 + 0x1b3) mod 2^64: the 2^40 term adds the low 24 bits of lo, shifted 8, to hi.
    const loProduct = lo * FNV64_PRIME_LO;
    const carry = Math.floor(loProduct / TWO_POW_32);
    hi = (hi * FNV64_PRIME_LO + carry + (lo & 0xffffff) * 256) % TWO_POW_32;
    lo = loProduct % TWO_POW_32;
  }
  return hi.toString(16).padStart(8, '0') + lo.toString(16).padStart(8, '0');
}
