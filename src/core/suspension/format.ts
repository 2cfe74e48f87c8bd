/** Numbers as the user reads them in messages: up to `digits` significant figures, no trailing zeros. */
export function formatNumber(x: number, digits = 6): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(digits))) : String(x);
}
