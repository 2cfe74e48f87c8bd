/**
 * A 64-bit checksum of a text, to detect a corrupt checkpoint (a truncated write, a bit
 * flip, a hand edit). Not a cryptographic hash: it guards against accidents only.
 */

const FNV64_OFFSET_HI = 0xcbf29ce4;
const FNV64_OFFSET_LO = 0x84222325;
/** The 64-bit FNV prime is 2^40 + 0x1b3. */
const FNV64_PRIME_LO = 0x1b3;
const TWO_POW_16 = 0x1_0000;
const TWO_POW_32 = 0x1_0000_0000;

const encoder = new TextEncoder();

/**
 * FNV-1a, 64 bit, over the UTF-8 bytes of `text`, as 16 lowercase hex digits.
 * Fowler, Noll and Vo, "The FNV Non-Cryptographic Hash Algorithm" (IETF draft-eastlake-fnv).
 * The 64-bit product is carried in two 32-bit halves, with the low half's product split
 * into 16-bit parts so each step is integer arithmetic, exact and without division (the
 * checkpoint is hashed on the page's thread, inside its 50 ms budget).
 */
export function fnv1a64Hex(text: string): string {
  const bytes = encoder.encode(text);
  let hi = FNV64_OFFSET_HI;
  let lo = FNV64_OFFSET_LO;
  for (let i = 0; i < bytes.length; i++) {
    lo = (lo ^ bytes[i]) >>> 0;
    // h * (2^40 + 0x1b3) mod 2^64: lo * 0x1b3 (up to 41 bits) gives the new low half and
    // a carry into hi; the 2^40 term adds lo shifted left by 8 to hi.
    const lowPart = (lo & 0xffff) * FNV64_PRIME_LO;
    const highPart = (lo >>> 16) * FNV64_PRIME_LO;
    const sum = lowPart + (highPart & 0xffff) * TWO_POW_16;
    const carry = (highPart >>> 16) + (sum >= TWO_POW_32 ? 1 : 0);
    hi = (Math.imul(hi, FNV64_PRIME_LO) + carry + (lo << 8)) >>> 0;
    lo = sum >>> 0;
  }
  return hi.toString(16).padStart(8, '0') + lo.toString(16).padStart(8, '0');
}
