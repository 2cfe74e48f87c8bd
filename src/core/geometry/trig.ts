/**
 * Sine and cosine together, for the rotation driver of the kinematics kernel: one
 * shared range reduction instead of two calls into Math.sin and Math.cos.
 *
 * Range reduction by a two-part π/2 (Cody and Waite, 1980) and the minimax kernels of
 * fdlibm's __kernel_sin and __kernel_cos (Sun Microsystems, 1993). The absolute error is
 * within about one unit in the last place of 1 for |x| below SINCOS_REDUCTION_LIMIT;
 * beyond it (and for non-finite x) the functions defer to Math.sin and Math.cos.
 */

/** Largest |x| (rad) reduced here: 2^19 · π/2, where n · PIO2_HI is still exact. */
export const SINCOS_REDUCTION_LIMIT = 823549.6654785103;

const TWO_OVER_PI = 6.36619772367581382433e-1;
/** π/2 to 33 bits, so n · PIO2_HI is exact for |n| < 2^20. */
const PIO2_HI = 1.57079632673412561417;
/** π/2 − PIO2_HI. */
const PIO2_LO = 6.07710050650619224932e-11;

const S1 = -1.66666666666666324348e-1;
const S2 = 8.33333333332248946124e-3;
const S3 = -1.98412698298579493134e-4;
const S4 = 2.75573137070700676789e-6;
const S5 = -2.50507602534068634195e-8;
const S6 = 1.58969099521155010221e-10;

const C1 = 4.16666666666666019037e-2;
const C2 = -1.38888888888741095749e-3;
const C3 = 2.48015872894767294178e-5;
const C4 = -2.75573143513906633035e-7;
const C5 = 2.08757232129817482790e-9;
const C6 = -1.13596475577881948265e-11;

/**
 * The reduction and kernel constants of polarInto, for kernels generated from the same
 * arithmetic (src/core/linkage/specialise.ts), so those give polarInto's bits.
 */
export const SINCOS_CONSTANTS = { TWO_OVER_PI, PIO2_HI, PIO2_LO, S1, S2, S3, S4, S5, S6, C1, C2, C3, C4, C5, C6 } as const;

/**
 * Writes cx + r cos(angleRad) and cy + r sin(angleRad) to out[offset] and
 * out[offset + 1]: the tip of a link of length r turned to angleRad about (cx, cy).
 */
export function polarInto(out: Float64Array, offset: number, cx: number, cy: number, r: number, angleRad: number): void {
  if (!(Math.abs(angleRad) <= SINCOS_REDUCTION_LIMIT)) {
    out[offset] = cx + r * Math.cos(angleRad);
    out[offset + 1] = cy + r * Math.sin(angleRad);
    return;
  }
  const n = Math.round(angleRad * TWO_OVER_PI);
  const x = angleRad - n * PIO2_HI - n * PIO2_LO;
  const z = x * x;
  const sinX = x + x * z * (S1 + z * (S2 + z * (S3 + z * (S4 + z * (S5 + z * S6)))));
  const hz = 0.5 * z;
  const w = 1 - hz;
  const cosX = w + ((1 - w - hz) + z * z * (C1 + z * (C2 + z * (C3 + z * (C4 + z * (C5 + z * C6))))));
  let c: number;
  let s: number;
  switch (n & 3) {
    case 0: c = cosX; s = sinX; break;
    case 1: c = -sinX; s = cosX; break;
    case 2: c = -cosX; s = -sinX; break;
    default: c = sinX; s = -cosX; break;
  }
  out[offset] = cx + r * c;
  out[offset + 1] = cy + r * s;
}

/** Writes cos(angleRad) to out[offset] and sin(angleRad) to out[offset + 1]. */
export function cosSinInto(out: Float64Array, offset: number, angleRad: number): void {
  polarInto(out, offset, 0, 0, 1, angleRad);
}
