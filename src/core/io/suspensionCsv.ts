/**
 * The suspension curves as CSV: the caution, then one row per travel step, a column per curve and per
 * cog, the unit in each column's name. Numbers are written in full (the shortest
 * decimal that reads back to the same double); a value that does not exist (no chain
 * line, an instant centre at infinity in the position columns) is an empty cell.
 */
import { IC_FINITE, IC_INDETERMINATE, IC_INFINITE } from '../linkage/analysis';
import { SUSPENSION_CAUTION, type SuspensionReport } from '../suspension';

/** The instant centre's kind by name, as the CSV and `loci analyze` write it. */
export function instantCentreKindName(kind: number): 'finite' | 'infinite' | 'indeterminate' | 'unassembled' {
  if (kind === IC_FINITE) return 'finite';
  if (kind === IC_INFINITE) return 'infinite';
  if (kind === IC_INDETERMINATE) return 'indeterminate';
  return 'unassembled';
}

/** Per-cog columns: `anti_squat_pct_cog3_14t` is the third cog of the cassette, 14 teeth. */
export const PER_COG_CSV_COLUMNS = ['anti_squat_pct', 'chain_growth_mm', 'chain_growth_turning_cog_mm', 'kickback_deg'] as const;

export function cogColumnName(column: (typeof PER_COG_CSV_COLUMNS)[number], cogIndex: number, teeth: number): string {
  return `${column}_cog${cogIndex + 1}_${teeth}t`;
}

/**
 * CSV text of every curve of a report (RFC 4180, CRLF line ends): the caution as a `#`
 * comment line (a file travels without the page that showed the caution), then the
 * header, then one row per step.
 */
export function suspensionCurvesCsv(report: SuspensionReport): string {
  const c = report.curves;
  const columns: { readonly name: string; readonly at: (k: number) => number | string }[] = [
    { name: 'step', at: (k) => k },
    { name: 'travel_mm', at: (k) => c.travelMm[k] },
    { name: 'shock_length_mm', at: (k) => c.shockLengthMm[k] },
    { name: 'shock_travel_mm', at: (k) => c.shockTravelMm[k] },
    { name: 'axle_x_mm', at: (k) => c.axleXMm[k] },
    { name: 'axle_y_mm', at: (k) => c.axleYMm[k] },
    { name: 'axle_rearward_mm', at: (k) => c.rearwardMm[k] },
    { name: 'leverage_ratio', at: (k) => c.leverageRatio[k] },
  ];
  const force = c.springForceN;
  const rate = c.wheelRateNPerMm;
  if (force !== null && rate !== null) {
    columns.push({ name: 'spring_force_n', at: (k) => force[k] }, { name: 'wheel_rate_n_per_mm', at: (k) => rate[k] });
  }
  columns.push({ name: 'anti_rise_pct', at: (k) => c.antiRisePct[k] });
  const floating = c.antiRiseFloatingPct;
  if (floating !== null) columns.push({ name: 'anti_rise_floating_brake_pct', at: (k) => floating[k] });
  const ic = c.icPath;
  const finite = (k: number) => ic.kind[k] === IC_FINITE;
  const infinite = (k: number) => ic.kind[k] === IC_INFINITE;
  columns.push(
    { name: 'ic_kind', at: (k) => instantCentreKindName(ic.kind[k]) },
    { name: 'ic_x_mm', at: (k) => (finite(k) ? ic.xMm[k] : NaN) },
    { name: 'ic_y_mm', at: (k) => (finite(k) ? ic.yMm[k] : NaN) },
    { name: 'ic_direction_x', at: (k) => (infinite(k) ? ic.xMm[k] : NaN) },
    { name: 'ic_direction_y', at: (k) => (infinite(k) ? ic.yMm[k] : NaN) },
  );
  const perCog = {
    anti_squat_pct: c.antiSquatPct,
    chain_growth_mm: c.chainGrowthMm,
    chain_growth_turning_cog_mm: c.chainGrowthTurningCogMm,
    kickback_deg: c.kickbackDeg,
  } as const;
  for (const column of PER_COG_CSV_COLUMNS) {
    c.cogTeeth.forEach((teeth, i) => {
      const values = perCog[column][i];
      columns.push({ name: cogColumnName(column, i, teeth), at: (k) => values[k] });
    });
  }
  const cell = (v: number | string) => (typeof v === 'string' ? v : Number.isFinite(v) ? String(v) : '');
  const lines = [`# ${SUSPENSION_CAUTION}`, columns.map((col) => col.name).join(',')];
  for (let k = 0; k < c.steps; k++) lines.push(columns.map((col) => cell(col.at(k))).join(','));
  return `${lines.join('\r\n')}\r\n`;
}
