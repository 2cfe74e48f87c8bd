/**
 * The sign of a square matrix's determinant by Gaussian elimination with partial
 * pivoting: +1 or −1, 0 where a pivot falls below `pivotRelTol` of the largest entry (the
 * matrix is singular to that tolerance) or an entry is not finite. `a` is n × n, row-major,
 * and is destroyed. For a block's Jacobian (newton.ts), whose linear solve pivots by the
 * same rule (pivotRow).
 */
export function determinantSignInPlace(a: Float64Array, n: number, pivotRelTol: number): number {
  let largest = 0;
  for (let i = 0; i < n * n; i++) largest = Math.max(largest, Math.abs(a[i]));
  if (!(largest > 0 && largest < Infinity)) return 0;
  const tol = pivotRelTol * largest;
  let sign = 1;
  for (let k = 0; k < n; k++) {
    const q = pivotRow(a, n, k);
    if (!(Math.abs(a[q * n + k]) > tol)) return 0;
    if (q !== k) {
      sign = -sign;
      for (let j = k; j < n; j++) {
        const t = a[k * n + j];
        a[k * n + j] = a[q * n + j];
        a[q * n + j] = t;
      }
    }
    const pivot = a[k * n + k];
    if (pivot < 0) sign = -sign;
    const inv = 1 / pivot;
    for (let i = k + 1; i < n; i++) {
      const f = a[i * n + k] * inv;
      if (f !== 0) for (let j = k + 1; j < n; j++) a[i * n + j] -= f * a[k * n + j];
    }
  }
  return sign;
}

/** The row from k down whose entry in column k is largest in magnitude (the first such; k where none is larger): partial pivoting's choice. */
export function pivotRow(a: Float64Array, n: number, k: number): number {
  let q = k;
  let best = Math.abs(a[k * n + k]);
  for (let i = k + 1; i < n; i++) {
    const v = Math.abs(a[i * n + k]);
    if (v > best) {
      best = v;
      q = i;
    }
  }
  return q;
}
