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
/** Reused between pieces, grown to the largest piece hashed. */
let utf8Buffer = new Uint8Array(0);

/**
 * FNV-1a, 64 bit (Fowler, Noll and Vo, "The FNV Non-Cryptographic Hash Algorithm", IETF
 * draft-eastlake-fnv), as a running state: a long text can be hashed a piece at a time,
 * in separate tasks of the page's thread. The 64-bit product is carried in two 32-bit
 * halves, with the low half's product split into 16-bit parts so each step is integer
 * arithmetic, exact and without division.
 */
export class Fnv1a64 {
  private hi = FNV64_OFFSET_HI;
  private lo = FNV64_OFFSET_LO;

  /** Takes in bytes[from..to). */
  update(bytes: Uint8Array, from: number, to: number): void {
    let hi = this.hi;
    let lo = this.lo;
    for (let i = from; i < to; i++) {
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
    this.hi = hi;
    this.lo = lo;
  }

  /**
   * Takes in the UTF-8 bytes of text[from..to) (UTF-16 code units), through a buffer the
   * size of the piece, not of the text. A surrogate pair split at `to` is taken whole;
   * returns where the next piece starts.
   */
  updateText(text: string, from: number, to: number): number {
    let end = Math.min(to, text.length);
    const last = end > from ? text.charCodeAt(end - 1) : 0;
    if (end < text.length && last >= 0xd800 && last <= 0xdbff) end++;
    const piece = text.slice(from, end);
    // UTF-8 takes at most 3 bytes per UTF-16 code unit.
    if (utf8Buffer.length < 3 * piece.length) utf8Buffer = new Uint8Array(3 * piece.length);
    const { written } = encoder.encodeInto(piece, utf8Buffer);
    this.update(utf8Buffer, 0, written);
    return end;
  }

  /** The hash so far as 16 lowercase hex digits. */
  hex(): string {
    return this.hi.toString(16).padStart(8, '0') + this.lo.toString(16).padStart(8, '0');
  }
}

/** FNV-1a, 64 bit, over the UTF-8 bytes of `text`, as 16 lowercase hex digits. */
export function fnv1a64Hex(text: string): string {
  const hash = new Fnv1a64();
  hash.updateText(text, 0, text.length);
  return hash.hex();
}
