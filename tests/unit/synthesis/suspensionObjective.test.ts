/**
 * The suspension objective against the suspension analysis it stands for, and against
 * geometry written here: the report's figures are suspensionCurves' of the exported
 * linkage, the search's own curves agree with them, a design's own curves make it the
 * optimum of its problem, and a feasible design keeps every pivot and moving link out of
 * the keep-out circles over the whole stroke.
 */
import { describe, expect, it } from 'vitest';
import { compile, sweep } from '../../../src/core/linkage';
import { createOptimizer } from '../../../src/core/optimize';
import {
  DEMO_TRAIL_BIKE,
  LAYOUT_KINDS,
  LAYOUT_PIVOTS,
  demoPivots,
  singlePivot,
  DEMO_LAYOUTS,
  suspensionCurves,
  type LayoutKind,
} from '../../../src/core/suspension';
import {
  createObjective,
  createSuspensionProblem,
  layoutVariableNames,
  plainSuspensionReport,
  type SuspensionObjective,
  type SuspensionProblemInput,
} from '../../../src/core/synthesis';

const STEPS = 21;

/** The design vector of a layout's demo drawing: its pivots, and the shock's direction. */
function demoX(kind: LayoutKind): Float64Array {
  const p = demoPivots(kind);
  const values: number[] = [];
  for (const id of LAYOUT_PIVOTS[kind]) if (id !== 'shockFrameEye') values.push(p[id].x, p[id].y);
  values.push(Math.atan2(p.shockFrameEye.y - p.shockEye.y, p.shockFrameEye.x - p.shockEye.x));
  return Float64Array.from(values);
}

function problemOf(input: Partial<SuspensionProblemInput>) {
  const made = createSuspensionProblem({
    kind: 'suspension',
    name: 'test',
    bicycle: DEMO_TRAIL_BIKE,
    layouts: [...LAYOUT_KINDS],
    steps: STEPS,
    targets: { leverageRatio: { start: 2.9, end: 2.4 }, antiSquatAtSag: { cogs: [21, 24], minPct: 90, maxPct: 110, as: 'penalty' } },
    ...input,
  });
  if (!made.ok) throw new Error(made.issues.map((i) => `${i.path}: ${i.message}`).join('; '));
  return made.problem;
}

/** Linear interpolation written here, held at the ends. */
function lerp(xs: ArrayLike<number>, ys: ArrayLike<number>, at: number): number {
  if (at <= xs[0]) return ys[0];
  for (let k = 1; k < xs.length; k++) if (at <= xs[k]) return ys[k - 1] + ((at - xs[k - 1]) / (xs[k] - xs[k - 1])) * (ys[k] - ys[k - 1]);
  return ys[xs.length - 1];
}

describe('suspension objective: the report is the suspension analysis of the exported design', () => {
  const problem = problemOf({});
  for (const kind of LAYOUT_KINDS) {
    it(`${kind}: figures equal suspensionCurves of the linkage, and the score is read off them`, () => {
      const objective = createObjective(problem, kind);
      const x = demoX(kind);
      expect(objective.variableNames).toEqual(layoutVariableNames(kind));
      const report = objective.describe(x);
      const again = suspensionCurves(report.linkage, DEMO_TRAIL_BIKE, { steps: STEPS });
      expect(again.ok).toBe(true);
      if (!again.ok || report.suspension === null) throw new Error('not analysed');
      // Source: theorem (the same analysis of the same linkage gives the same figures).
      expect(report.suspension).toEqual(plainSuspensionReport(again.report));
      // The demo drawing is this layout's: the exported pivots are the drawing's.
      const drawn = demoPivots(kind);
      for (const id of LAYOUT_PIVOTS[kind]) {
        expect(report.pivots[id].x).toBeCloseTo(drawn[id].x, 9);
        expect(report.pivots[id].y).toBeCloseTo(drawn[id].y, 9);
      }
      // The search's own curves (allocation-free kernel) agree with the analysis: the
      // leverage-shape deviation and anti-squat band recomputed here from its curves.
      const c = again.report.curves;
      const total = c.travelMm[STEPS - 1];
      let sum = 0;
      for (let k = 0; k < STEPS; k++) {
        const target = 2.9 + (2.4 - 2.9) * (c.travelMm[k] / total);
        sum += (c.leverageRatio[k] - target) ** 2;
      }
      const lrTerm = report.terms.find((t) => t.name === 'leverage ratio');
      expect(lrTerm?.deviation).toBeCloseTo(Math.sqrt(sum / STEPS), 9);
      const sag = DEMO_TRAIL_BIKE.sag * total;
      let band = 0;
      for (const z of [21, 24]) {
        const a = lerp(c.travelMm, c.antiSquatPct[DEMO_TRAIL_BIKE.cogTeeth.indexOf(z)], sag);
        const out = a < 90 ? 90 - a : a > 110 ? a - 110 : 0;
        band += out * out;
      }
      const asTerm = report.terms.find((t) => t.name === 'anti-squat at sag');
      expect(asTerm?.deviation).toBeCloseTo(Math.sqrt(band / 2), 7);
      const out = new Float64Array(2);
      objective.evaluate(x, out);
      expect(out[0]).toBe(report.value);
      expect(report.value).toBeCloseTo((Math.sqrt(sum / STEPS) / 0.05) ** 2 + (band / 2) / 25, 6);
    });
  }
});

function search(objective: SuspensionObjective, seed: number, maxEvaluations: number) {
  const made = createOptimizer({ kind: 'hybrid', dim: objective.dim, seed, maxEvaluations });
  if (!made.ok) throw new Error(made.reason);
  const optimizer = made.optimizer;
  const x = new Float64Array(objective.dim);
  const out = new Float64Array(2);
  while (!optimizer.done()) {
    const batch = optimizer.ask();
    const values = new Float64Array(batch.length);
    const violations = new Float64Array(batch.length);
    for (let k = 0; k < batch.length; k++) {
      objective.fromSearchBoxInto(batch[k], x);
      objective.evaluate(x, out);
      values[k] = out[0];
      violations[k] = out[1];
    }
    optimizer.tell(batch, values, violations);
  }
  const best = optimizer.best();
  const xBest = new Float64Array(objective.dim);
  objective.fromSearchBoxInto(best.x, xBest);
  return { value: best.value, violation: best.violation, x: xBest };
}

describe('suspension objective: a design generated from its own curves is found again', () => {
  // The single pivot of the demo, analysed; its axle path and leverage ratio become the targets.
  const generated = suspensionCurves(singlePivot(DEMO_LAYOUTS.singlePivot), DEMO_TRAIL_BIKE, { steps: STEPS });
  if (!generated.ok) throw new Error(generated.reason);
  const c = generated.report.curves;
  const picks = [0, 4, 8, 12, 16, 20];
  const problem = problemOf({
    layouts: ['singlePivot'],
    targets: {
      axlePath: { points: picks.map((k) => [c.travelMm[k], c.axleXMm[k]]) },
      leverageRatio: { points: picks.map((k) => [c.travelMm[k], c.leverageRatio[k]]) },
    },
  });
  const objective = createObjective(problem, 'singlePivot');

  it('the generating design scores zero', () => {
    const out = new Float64Array(2);
    objective.evaluate(demoX('singlePivot'), out);
    // Source: theorem (a design matches its own curves exactly; the value is a sum of squares, so 0 is the optimum).
    expect(out[1]).toBe(0);
    expect(out[0]).toBeLessThan(1e-18);
  });

  it('a seeded search with a small budget reaches near-zero error', () => {
    const found = search(objective, 1, 20000);
    expect(found.violation).toBe(0);
    // RMS under 1e-5 mm of axle path and 5e-7 of leverage ratio (tolerances 1 mm and 0.05).
    expect(found.value).toBeLessThan(1e-10);
    // Source: theorem (the axle moves on a circle about the main pivot, and a circle through three points is unique).
    expect(found.x[0]).toBeCloseTo(DEMO_LAYOUTS.singlePivot.mainPivot.x, 3);
    expect(found.x[1]).toBeCloseTo(DEMO_LAYOUTS.singlePivot.mainPivot.y, 3);
  });
});

/** Distance from (px, py) to the segment a–b, written here. */
function segmentDistance(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax;
  const dy = by - ay;
  const t = Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / (dx * dx + dy * dy)));
  return Math.hypot(px - (ax + t * dx), py - (ay + t * dy));
}

describe('suspension objective: keep-out circles', () => {
  // A circle on the seat tube's line and one about the bottom bracket's chainring.
  const keepOut = [
    { name: 'seat tube', x: -60, y: 300, r: 28 },
    { name: 'chainring', x: 0, y: 0, r: 40 },
  ];
  const problem = problemOf({ layouts: ['fourBarSeatStayAxle', 'singlePivot'], keepOut });

  /** Clearance checked here: every joint and every joint-to-joint segment of each moving body at every step. */
  function clear(report: ReturnType<SuspensionObjective['describe']>): boolean {
    const compiled = compile(report.linkage);
    if (!compiled.ok) return false;
    const plan = compiled.plan;
    const e2e = DEMO_TRAIL_BIKE.shock.eyeToEyeMm;
    const sw = sweep(plan, { from: e2e, to: e2e - DEMO_TRAIL_BIKE.shock.strokeMm, steps: STEPS });
    const stride = 2 * plan.slotCount;
    const jointCount = plan.jointIds.length;
    for (let k = 0; k < STEPS; k++) {
      const at = k * stride;
      const P = (s: number) => [sw.poses[at + 2 * s], sw.poses[at + 2 * s + 1]] as const;
      for (const c of keepOut) {
        for (let s = 0; s < jointCount; s++) {
          const [x, y] = P(s);
          if (Math.hypot(x - c.x, y - c.y) < c.r) return false;
        }
        for (let b = 1; b < plan.bodies.length; b++) {
          const slots = Array.from(plan.bodies[b].slots).filter((s) => s < jointCount);
          for (let i = 0; i < slots.length; i++) for (let j = i + 1; j < slots.length; j++) {
            const [ax, ay] = P(slots[i]);
            const [bx, by] = P(slots[j]);
            if (segmentDistance(c.x, c.y, ax, ay, bx, by) < c.r) return false;
          }
        }
      }
    }
    return true;
  }

  for (const kind of ['fourBarSeatStayAxle', 'singlePivot'] as const) {
    it(`${kind}: every feasible design of a seeded sample is clear, and the circles bite`, () => {
      const objective = createObjective(problem, kind);
      const x = new Float64Array(objective.dim);
      const u = new Float64Array(objective.dim);
      let seed = 7;
      const next = () => {
        seed = (Math.imul(seed, 1103515245) + 12345) >>> 0;
        return seed / 4294967296;
      };
      let feasible = 0;
      let keptOut = 0;
      for (let i = 0; i < 60; i++) {
        for (let j = 0; j < objective.dim; j++) u[j] = next();
        objective.fromSearchBoxInto(u, x);
        const report = objective.describe(x);
        if (report.feasible) {
          feasible++;
          // Source: theorem (a point or segment at distance ≥ r from the centre is outside the circle).
          expect(clear(report)).toBe(true);
        } else if (report.defects.includes('a pivot or a moving link enters a keep-out circle')) {
          keptOut++;
          expect(clear(report)).toBe(false);
        }
      }
      expect(feasible).toBeGreaterThan(0);
      expect(keptOut).toBeGreaterThan(0);
      const best = search(objective, 3, 1500);
      if (best.violation === 0) expect(clear(objective.describe(best.x))).toBe(true);
    });
  }
});
