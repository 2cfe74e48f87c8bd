/**
 * The one seeded pseudo-random generator of Loci.
 *
 * xoshiro128** (Blackman and Vigna, 2021, "Scrambled linear pseudorandom number
 * generators", ACM TOMS 47(4)), its state seeded through SplitMix64 (Steele, Lea and
 * Flood, 2014) as the xoshiro authors recommend. Streams for islands come from the
 * generator's jump function, which advances the state by 2^64 draws, so split streams
 * never overlap unless one of them draws 2^64 numbers.
 *
 * The state is four 32-bit words and crosses JSON as `number[]`. Integer, uniform and
 * Cauchy outputs use exact arithmetic only; normal deviates use Math.log, which
 * ECMAScript does not require to be correctly rounded, so a seeded run is bit-identical
 * on one engine (V8 in Node and in Chrome alike) but may differ in the last bits on another.
 */

const TWO_POW_32 = 4294967296;
const INV_TWO_POW_32 = 1 / TWO_POW_32;
/** xoshiro128 jump polynomial: one jump is 2^64 calls of `nextUint32` (Blackman and Vigna). */
const JUMP_WORDS = [0x8764000b, 0xf542d2d3, 0x6fa035c3, 0x77f2db5b] as const;
const MASK_64 = (1n << 64n) - 1n;

/** Largest stream index `split` accepts: each index costs one jump (128 draws) more. */
export const MAX_STREAM = 65535;
/** Largest range `int(n)` accepts: `n · 2^32` must stay exact in a double. */
export const MAX_INT_RANGE = 2 ** 21;
/** Rejection sampling in `int` retries at most this often (each retry has probability < 1/2). */
const INT_REJECTION_CAP = 64;
/** Draws of a point in the unit disc before a fallback (each misses with p = 1 − π/4 < 0.22). */
const DISC_REJECTION_CAP = 64;

export interface PrngState {
  readonly algorithm: 'xoshiro128**';
  /** The four state words, each an integer in [0, 2^32), not all zero. */
  readonly words: readonly number[];
}

export class Prng {
  private readonly s: Int32Array;
  /** The last output of `advance`, read as an unsigned 32-bit integer. */
  private readonly word = new Uint32Array(1);

  private constructor(words: Int32Array) {
    this.s = words;
  }

  /** A generator from a non-negative safe integer seed. */
  static fromSeed(seed: number): Prng {
    if (!(Number.isSafeInteger(seed) && seed >= 0)) {
      throw new RangeError(`seed is ${seed}; expected a safe integer ≥ 0`);
    }
    // SplitMix64 (Steele, Lea and Flood, 2014), as in Vigna's splitmix64.c.
    let x = BigInt(seed);
    const words = new Int32Array(4);
    for (let k = 0; k < 2; k++) {
      x = (x + 0x9e3779b97f4a7c15n) & MASK_64;
      let z = x;
      z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & MASK_64;
      z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & MASK_64;
      z ^= z >> 31n;
      words[2 * k] = Number(z & 0xffffffffn) | 0;
      words[2 * k + 1] = Number(z >> 32n) | 0;
    }
    if ((words[0] | words[1] | words[2] | words[3]) === 0) words[0] = 1;
    return new Prng(words);
  }

  /** Checks a state read from JSON; says what is wrong, or returns null. */
  static checkState(state: unknown): string | null {
    if (typeof state !== 'object' || state === null) return 'is not an object';
    const { algorithm, words } = state as { algorithm?: unknown; words?: unknown };
    if (algorithm !== 'xoshiro128**') return `algorithm is ${JSON.stringify(algorithm)}; expected "xoshiro128**"`;
    if (!Array.isArray(words) || words.length !== 4) return 'words must be an array of 4 integers';
    for (const w of words) {
      if (!(Number.isInteger(w) && w >= 0 && w < TWO_POW_32)) return `words holds ${JSON.stringify(w)}; expected integers in [0, 2^32)`;
    }
    if (words.every((w) => w === 0)) return 'words are all zero; xoshiro needs a non-zero state';
    return null;
  }

  /** A generator from an exported state; throws if `checkState` would reject it. */
  static fromState(state: PrngState): Prng {
    const problem = Prng.checkState(state);
    if (problem !== null) throw new RangeError(`PRNG state ${problem}`);
    return new Prng(Int32Array.from(state.words, (w) => w | 0));
  }

  exportState(): PrngState {
    return { algorithm: 'xoshiro128**', words: Array.from(this.s, (w) => w >>> 0) };
  }

  /** An independent copy that continues this stream exactly. */
  clone(): Prng {
    return new Prng(Int32Array.from(this.s));
  }

  /**
   * Stream `k` (0 ≤ k ≤ MAX_STREAM): this state advanced by (k + 1) jumps of 2^64 draws.
   * Deterministic, leaves this generator unchanged; streams of different k, and this
   * stream itself, do not overlap for 2^64 draws each.
   */
  split(k: number): Prng {
    if (!(Number.isInteger(k) && k >= 0 && k <= MAX_STREAM)) {
      throw new RangeError(`stream is ${k}; expected an integer in [0, ${MAX_STREAM}]`);
    }
    const child = this.clone();
    for (let j = 0; j <= k; j++) child.jump();
    return child;
  }

  /** The next 32-bit output, an integer in [0, 2^32). */
  nextUint32(): number {
    this.advance();
    return this.word[0];
  }

  /** Uniform in [0, 1) on a grid of 2^-32 (one draw). */
  float(): number {
    this.advance();
    return this.word[0] * INV_TWO_POW_32;
  }

  /**
   * Uniform integer in [0, n), exactly uniform, for an integer 1 ≤ n ≤ MAX_INT_RANGE.
   * Lemire (2019), "Fast random integer generation in an interval": multiply, and
   * reject the few low products that would bias the result.
   */
  int(n: number): number {
    if (!((n | 0) === n && n >= 1 && n <= MAX_INT_RANGE)) throw new RangeError(`int range is ${n}; expected an integer in [1, 2^21]`);
    const word = this.word;
    this.advance();
    let m = word[0] * n;
    let high = Math.floor(m * INV_TWO_POW_32);
    let low = m - high * TWO_POW_32;
    if (low < n) {
      const threshold = (TWO_POW_32 - n) % n;
      for (let tries = 0; low < threshold && tries < INT_REJECTION_CAP; tries++) {
        this.advance();
        m = word[0] * n;
        high = Math.floor(m * INV_TWO_POW_32);
        low = m - high * TWO_POW_32;
      }
    }
    return high;
  }

  /** Fills `out[0..count)` with uniforms in [0, 1), the same numbers `count` calls of `float()` give. */
  fillFloats(out: Float64Array, count: number): void {
    const s = this.s;
    let s0 = s[0];
    let s1 = s[1];
    let s2 = s[2];
    let s3 = s[3];
    for (let k = 0; k < count; k++) {
      const m = Math.imul(s1, 5);
      out[k] = (Math.imul((m << 7) | (m >>> 25), 9) >>> 0) * INV_TWO_POW_32;
      s2 ^= s0;
      s3 ^= s1;
      const t = s1 << 9;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= t;
      s3 = (s3 << 11) | (s3 >>> 21);
    }
    s[0] = s0;
    s[1] = s1;
    s[2] = s2;
    s[3] = s3;
  }

  /**
   * Fills `out[0..count)` with standard normal deviates, two per point of the unit disc
   * (the polar method, Marsaglia and Bray, 1964): cheaper than `count` calls of `normal()`.
   */
  fillNormals(out: Float64Array, count: number): void {
    for (let k = 0; k < count; k += 2) {
      let u = 0;
      let v = 0;
      let s = 0;
      for (let tries = 0; tries < DISC_REJECTION_CAP && !(s < 1 && s > 0); tries++) {
        u = 2 * this.float() - 1;
        v = 2 * this.float() - 1;
        s = u * u + v * v;
      }
      let first: number;
      let second: number;
      if (s < 1 && s > 0) {
        const scale = Math.sqrt((-2 * Math.log(s)) / s);
        first = u * scale;
        second = v * scale;
      } else {
        // Practically unreachable (p < 0.22^64): Box and Muller (1958).
        const radius = Math.sqrt(-2 * Math.log(1 - this.float()));
        const angle = 2 * Math.PI * this.float();
        first = radius * Math.cos(angle);
        second = radius * Math.sin(angle);
      }
      out[k] = first;
      if (k + 1 < count) out[k + 1] = second;
    }
  }

  /**
   * Standard normal deviate by the polar method (Marsaglia and Bray, 1964): for (u, v)
   * uniform in the unit disc, u · sqrt(−2 ln s / s) with s = u² + v². Only u's deviate
   * is used, so no spare is cached and the state stays four words.
   */
  normal(): number {
    for (let tries = 0; tries < DISC_REJECTION_CAP; tries++) {
      const u = 2 * this.float() - 1;
      const v = 2 * this.float() - 1;
      const s = u * u + v * v;
      if (s < 1 && s > 0) return u * Math.sqrt((-2 * Math.log(s)) / s);
    }
    // Practically unreachable (p < 0.22^64): Box and Muller (1958).
    return Math.sqrt(-2 * Math.log(1 - this.float())) * Math.cos(2 * Math.PI * this.float());
  }

  /** Fills `out[0..count)` with what `count` calls of `cauchy()` give. */
  fillCauchy(out: Float64Array, count: number): void {
    for (let k = 0; k < count; k++) out[k] = this.cauchy();
  }

  /**
   * Standard Cauchy deviate (location 0, scale 1): v / u for (u, v) uniform in the unit
   * disc, the tangent of a uniform angle without computing one (Devroye, 1986,
   * "Non-uniform random variate generation").
   */
  cauchy(): number {
    for (let tries = 0; tries < DISC_REJECTION_CAP; tries++) {
      const u = 2 * this.float() - 1;
      const v = 2 * this.float() - 1;
      if (u * u + v * v < 1) {
        const ratio = v / u;
        if (ratio > -Infinity && ratio < Infinity) return ratio; // u = 0 gives ±Infinity or NaN
      }
    }
    // Practically unreachable: the tangent by inversion.
    return Math.tan(Math.PI * (this.float() - 0.5));
  }

  /**
   * One xoshiro128** step; its output goes to `word[0]`, not a return value: an integer of
   * 2^31 or more returned from a call the compiler does not inline is boxed (16 bytes).
   */
  private advance(): void {
    const s = this.s;
    const s0 = s[0];
    const s1 = s[1];
    const s2 = s[2] ^ s0;
    const s3 = s[3] ^ s1;
    const m = Math.imul(s1, 5);
    this.word[0] = Math.imul((m << 7) | (m >>> 25), 9);
    s[0] = s0 ^ s3;
    s[1] = s1 ^ s2;
    s[2] = s2 ^ (s1 << 9);
    s[3] = (s3 << 11) | (s3 >>> 21);
  }

  private jump(): void {
    const s = this.s;
    let a = 0;
    let b = 0;
    let c = 0;
    let d = 0;
    for (const word of JUMP_WORDS) {
      for (let bit = 0; bit < 32; bit++) {
        if (((word >>> bit) & 1) !== 0) {
          a ^= s[0];
          b ^= s[1];
          c ^= s[2];
          d ^= s[3];
        }
        this.advance();
      }
    }
    s[0] = a;
    s[1] = b;
    s[2] = c;
    s[3] = d;
  }
}
