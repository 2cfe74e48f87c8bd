/**
 * The suspension curves CSV read back by an independent reader (papaparse): one row per
 * step, every number exactly the report's, empty cells where a value does not exist.
 */
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { PER_COG_CSV_COLUMNS, cogColumnName, suspensionCurvesCsv } from '../../src/core/io/suspensionCsv';
import { IC_FINITE, IC_INDETERMINATE, IC_INFINITE, IC_UNASSEMBLED } from '../../src/core/linkage/analysis';
import { DEMO_LAYOUTS, DEMO_TRAIL_BIKE, SUSPENSION_CAUTION, fourBarSeatStayAxle, singlePivot, suspensionCurves, type SuspensionReport } from '../../src/core/suspension';

function report(linkage: Parameters<typeof suspensionCurves>[0], options = {}): SuspensionReport {
  const r = suspensionCurves(linkage, DEMO_TRAIL_BIKE, options);
  if (!r.ok) throw new Error(r.reason);
  return r.report;
}

const KIND_NAME: Record<number, string> = { [IC_FINITE]: 'finite', [IC_INFINITE]: 'infinite', [IC_INDETERMINATE]: 'indeterminate', [IC_UNASSEMBLED]: 'unassembled' };

type Row = Record<string, number | string | null>;
function readBack(csv: string): { fields: string[]; rows: Row[] } {
  // Source: RFC 4180 (CSV), read by papaparse with dynamic typing, an independent parser
  // The file opens with the caution as a comment line, which a CSV reader is told to skip.
  expect(csv.startsWith(`# ${SUSPENSION_CAUTION}\r\n`)).toBe(true);
  const parsed = Papa.parse<Row>(csv.trimEnd(), { header: true, dynamicTyping: true, comments: '#' });
  expect(parsed.errors).toEqual([]);
  return { fields: parsed.meta.fields ?? [], rows: parsed.data };
}

/** A cell read back: the number, or NaN for an empty cell (papaparse gives null). */
const num = (v: number | string | null | undefined): number => (typeof v === 'number' ? v : Number.NaN);

describe('suspensionCurvesCsv', () => {
  it('reads back to exactly the report\'s numbers, a row per step and a column per curve and per cog', () => {
    const r = report(fourBarSeatStayAxle(DEMO_LAYOUTS.fourBarSeatStayAxle), { steps: 17, floatingBrakeBody: 'chainStay' });
    const c = r.curves;
    const { fields, rows } = readBack(suspensionCurvesCsv(r));
    expect(rows).toHaveLength(17);
    for (const name of ['travel_mm', 'shock_length_mm', 'leverage_ratio', 'spring_force_n', 'wheel_rate_n_per_mm', 'anti_rise_pct', 'anti_rise_floating_brake_pct', 'ic_x_mm']) {
      expect(fields).toContain(name);
    }
    expect(fields).toHaveLength(new Set(fields).size);
    expect(fields.filter((f) => f.includes('_cog'))).toHaveLength(PER_COG_CSV_COLUMNS.length * c.cogTeeth.length);
    const same = (a: number, b: number) => expect(Object.is(a, b) || (Number.isNaN(a) && Number.isNaN(b))).toBe(true);
    rows.forEach((row, k) => {
      expect(row.step).toBe(k);
      same(num(row.travel_mm), c.travelMm[k]);
      same(num(row.shock_length_mm), c.shockLengthMm[k]);
      same(num(row.shock_travel_mm), c.shockTravelMm[k]);
      same(num(row.axle_x_mm), c.axleXMm[k]);
      same(num(row.axle_y_mm), c.axleYMm[k]);
      same(num(row.axle_rearward_mm), c.rearwardMm[k]);
      same(num(row.leverage_ratio), c.leverageRatio[k]);
      same(num(row.spring_force_n), c.springForceN![k]);
      same(num(row.wheel_rate_n_per_mm), c.wheelRateNPerMm![k]);
      same(num(row.anti_rise_pct), c.antiRisePct[k]);
      same(num(row.anti_rise_floating_brake_pct), c.antiRiseFloatingPct![k]);
      expect(row.ic_kind).toBe(KIND_NAME[c.icPath.kind[k]]);
      if (c.icPath.kind[k] === IC_FINITE) {
        same(num(row.ic_x_mm), c.icPath.xMm[k]);
        same(num(row.ic_y_mm), c.icPath.yMm[k]);
        expect(row.ic_direction_x).toBeNull();
      }
      c.cogTeeth.forEach((teeth, i) => {
        same(num(row[cogColumnName('anti_squat_pct', i, teeth)]), c.antiSquatPct[i][k]);
        same(num(row[cogColumnName('chain_growth_mm', i, teeth)]), c.chainGrowthMm[i][k]);
        same(num(row[cogColumnName('chain_growth_turning_cog_mm', i, teeth)]), c.chainGrowthTurningCogMm[i][k]);
        same(num(row[cogColumnName('kickback_deg', i, teeth)]), c.kickbackDeg[i][k]);
      });
    });
  });

  it('leaves out the spring and floating-brake columns when there are none, and writes NaN as an empty cell', () => {
    const r = suspensionCurves(singlePivot(DEMO_LAYOUTS.singlePivot), { ...DEMO_TRAIL_BIKE, spring: undefined }, { steps: 3 });
    if (!r.ok) throw new Error(r.reason);
    r.report.curves.antiSquatPct[0][1] = Number.NaN;
    const { fields, rows } = readBack(suspensionCurvesCsv(r.report));
    expect(fields).not.toContain('spring_force_n');
    expect(fields).not.toContain('anti_rise_floating_brake_pct');
    expect(rows[1][cogColumnName('anti_squat_pct', 0, 10)]).toBeNull();
  });
});
