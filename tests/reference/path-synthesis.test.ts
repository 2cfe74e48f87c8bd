/**
 * Published four-bar path-synthesis benchmarks (tests/reference/data/path-synthesis.json),
 * posed as the papers pose them: the literature variables r1 … r4, rcx, rcy, θ0, x0, y0
 * and, where timing is free, one crank angle θ2_i per point; their boxes; the objective
 * Σ |C(θ2_i) − Q_i|² (no mean, no root); Grashof with the crank r2 shortest; θ2_i
 * increasing. Each case is read from the reference file and from its problem file
 * (tests/reference/problems/<id>.json, checked here against the published data), then
 * searched with our hybrid optimizer (L-SHADE, then Nelder–Mead polish) from a fixed
 * seed on a budget of evaluations that fits CI, and must reach reference_best within
 * 1 % (value ≤ 1.01 · reference_best).
 *
 * Sources and confidence, as the reference file records them (kept with each case
 * below and printed with the result):
 * - line6-untimed: Kunjur & Krishnamurty 1997 (J. Applied Mechanisms and Robotics
 *   4(2):18-24); reused by Cabrera, Simon & Prado 2002 (Mech. Mach. Theory 37:1165-1177),
 *   Acharyya & Mandal 2009 (Mech. Mach. Theory 44:1784-1794). Confidence: points high
 *   (recalled), bounds medium, attribution medium. reference_best is not a literature
 *   value: the best an independent implementation reached.
 * - timed5: Cabrera, Simon & Prado 2002; Acharyya & Mandal 2009. Confidence: points high,
 *   angles high, bounds low (not reliably recalled: ours are stated in the problem
 *   file), attribution medium. reference_best is the floor set by the 3-decimal
 *   rounding of the published points.
 * - closed18-untimed: Cabrera, Simon & Prado 2002; Acharyya & Mandal 2009 (attribution
 *   from memory). Confidence: points medium (6th point x = 0.005 might be 0.05), bounds
 *   medium-low, attribution medium-low. reference_best is not a literature value.
 *
 * Conventions (what we found; the reference implementation's are unknown):
 * - Untimed crank angles: θ2_i ∈ [0, 2π] strictly as a sequence, no wrap through 2π
 *   ("wrap": false). With wrap the problem is a relaxation (its optimum can only be
 *   lower) but the search is harder: on line6 the no-wrap search reaches ~1e-23 …
 *   1e-28 in 0.3–0.6 M evaluations on most seeds, the wrap search stalled at 1e-6 …
 *   2e-4 on 3 of 4 seeds; on closed18 the wrap searches stalled at 1.3–4 × the reference.
 * - Assembly branch ('open' puts the coupler–rocker joint to the left of crank pin →
 *   rocker pivot): timed5 reaches the floor on both branches, but 'crossed' has a local
 *   minimum at 3.71e-6 that caught 5 of 8 seed/schedule runs, 'open' none of 8; line6
 *   reaches ~0 on both; closed18's best designs are on 'crossed'.
 * - Reliability at these budgets (the same schedule with seeds 1 … 8, or 1 … 6): line6
 *   6 of 6 seeds reach ~1e-23 … 1e-28; timed5 ('open') 5 of 5 reach 2.710892e-7;
 *   closed18 with the affine map (its earlier schedule: 2e6 evaluations, globalShare 0.5)
 *   5 of 8 reached 1.0032–1.0033 × (seed 1 stalled at 3.9 ×; seeds 2 and 7 at the
 *   degenerate r2 → 0 design, value 2.53, that the published box r2 ∈ [0, 50] admits);
 *   with the 'fourbar-boundary' map at 2e5, 10 of 10 (seeds 1 … 10) and 10 of 10
 *   (seeds 11 … 20) reach 1.0032–1.0049 ×.
 * - Grashof strictly, in every case: a change point does not turn fully. closed18's
 *   best designs sit on the Grashof boundary (crank-rockers with r1 at its upper bound
 *   50): strictly Grashof, the best value found is 3.2425e-3 (1.027 × reference_best),
 *   hence its 3 % allowance. Earlier, a declared slack of 1e-4 of the longest link
 *   (s + l − p − q ≤ 0.005 for l = 50) let the search reach the reference, and the value
 *   fell fast with more slack (≈ 2.94e-3 at 3e-4), but those designs cannot turn fully,
 *   so the slack is gone; the closed18 figures below that name 1.003 × were measured
 *   with it.
 * - closed18 at smaller budgets with the affine map (measured, same objective, hybrid
 *   defaults but the share named): at 3e5 evaluations no seed of 1 … 12 reaches the
 *   reference, with globalShare 0.5 (3 end at the degenerate 2.53, the hybrid stopping 'converged' at 1.6–1.8e5 with
 *   budget unused; 7 at 4.1–4.2 ×) nor 0.8 (10 at 4.0–6.6 ×). Solving the crank angles
 *   inside the evaluation does worse: in-order matching on the sampled curve ('unprescribed',
 *   9 variables) ends at 26–89 × after 2e5 (hybrid) and 47–128 × after 4e5 (L-SHADE), and
 *   free timing with Newton refinement written back into the search (Lamarckian) at
 *   350–480 × after 2e5, although both give the reference design its value (1.0032 ×):
 *   they make large coupler curves that pass through the target cloud an easy basin.
 * - closed18 with the 'fourbar-boundary' search map (src/core/synthesis/searchMap.ts:
 *   the same problem, variables, bounds and value; only the search box's map to designs
 *   changes: logarithmic lengths and offsets, r4 as r1 plus an offset, r2 a share of the
 *   largest Grashof crank, the crank angles as increasing order statistics). Measured
 *   with the default hybrid of the time (global share 0.8) at 2e5 evaluations, seeds
 *   1 … 10 (median, worst, seeds
 *   within 1 %): affine map 4.23 ×, 802 × (the r2 → 0 design), 0 of 10; angles as order
 *   statistics alone 4.34 ×, 7.8 ×, 0; with the Grashof crank 4.22 ×, 10.9 ×, 0; with
 *   logarithmic lengths (rate 9) 1.24 ×, 4.8 ×, 0; with r4 following r1 as well
 *   1.0032 ×, 1.0034 ×, 10 of 10 (every seed on the design with r1 at its bound 50).
 *   Sorting the angles instead (a repair, many-to-one) did worse than the affine map:
 *   4.99 ×, 22.5 ×, 0. The map is no default: on line6 and timed5 at 1e5 the
 *   logarithmic scale makes the search much worse (line6 median 2e5 ×, timed5 6.0 ×,
 *   against ~0 and 1.49 × affine), their optimal links being of the box's own size.
 */
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { parseProblemFile } from '../../src/core/io/problem';
import { compile, run } from '../../src/core/linkage';
import { createOptimizer, type HybridConfig } from '../../src/core/optimize';
import { createObjective, type SearchMapKind } from '../../src/core/synthesis';

const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
// The published cases with their sources and confidence tags, kept in the repository.
const referencePath = resolve(repoRoot, 'tests/reference/data/path-synthesis.json');

interface ReferenceCase {
  id: string;
  source: string;
  confidence: Record<string, string>;
  points: number[][];
  closed: boolean;
  timing: { prescribed: boolean; angles_deg?: number[] };
  bounds: Record<string, number[] | string>;
  reference_best: number;
}

const reference: ReferenceCase[] = JSON.parse(readFileSync(referencePath, 'utf8'));

function referenceCase(id: string): ReferenceCase {
  const c = reference.find((r) => r.id === id);
  if (c === undefined) throw new Error(`${referencePath} has no case ${id}`);
  return c;
}

function problemFile(id: string): Record<string, unknown> {
  return JSON.parse(readFileSync(resolve(repoRoot, 'tests/reference/problems', `${id}.json`), 'utf8'));
}

interface Run {
  value: number;
  violation: number;
  evaluations: number;
  seconds: number;
  evaluationsPerSecond: number;
  x: Float64Array;
}

function search(objective: ReturnType<typeof createObjective>, config: Omit<HybridConfig, 'dim'>): Run {
  const made = createOptimizer({ ...config, dim: objective.dim });
  if (!made.ok) throw new Error(made.reason);
  const optimizer = made.optimizer;
  const x = new Float64Array(objective.dim);
  const out = new Float64Array(2);
  let evaluateMs = 0;
  const start = performance.now();
  while (!optimizer.done()) {
    const batch = optimizer.ask();
    const values = new Float64Array(batch.length);
    const violations = new Float64Array(batch.length);
    const t0 = performance.now();
    for (let k = 0; k < batch.length; k++) {
      objective.fromSearchBoxInto(batch[k], x);
      objective.evaluate(x, out);
      values[k] = out[0];
      violations[k] = out[1];
    }
    evaluateMs += performance.now() - t0;
    optimizer.tell(batch, values, violations);
  }
  const seconds = (performance.now() - start) / 1000;
  const best = optimizer.best();
  const xBest = new Float64Array(objective.dim);
  objective.fromSearchBoxInto(best.x, xBest);
  return {
    value: best.value,
    violation: best.violation,
    evaluations: optimizer.evaluations(),
    seconds,
    evaluationsPerSecond: optimizer.evaluations() / (evaluateMs / 1000),
    x: xBest,
  };
}

/** The published objective recomputed through the kinematics core from the reported linkage: an independent path. */
function sumOfSquaresThroughLinkage(objective: ReturnType<typeof createObjective>, x: Float64Array, points: number[][]): number {
  const report = objective.describe(x);
  const compiled = compile(report.linkage);
  if (!compiled.ok) throw new Error(JSON.stringify(compiled.issues));
  const plan = compiled.plan;
  const pose = Float64Array.from(plan.reference);
  const p = 2 * (plan.slotIndex.get('P') ?? -1);
  const theta0 = report.variables.theta0;
  let sum = 0;
  report.driverValues.forEach((theta2, i) => {
    // The linkage's driver value is the crank's absolute angle: θ0 + θ2.
    expect(run(plan, theta0 + theta2, pose)).toBe(true);
    sum += (pose[p] - points[i][0]) ** 2 + (pose[p + 1] - points[i][1]) ** 2;
  });
  return sum;
}

/** The papers' constraints, checked here on the design itself. */
function checkPublishedConstraints(x: Float64Array, names: readonly string[], untimed: boolean): void {
  const v = (name: string) => x[names.indexOf(name)];
  const r = [v('r1'), v('r2'), v('r3'), v('r4')];
  const s = Math.min(...r);
  const l = Math.max(...r);
  expect(r[1]).toBeLessThanOrEqual(Math.min(r[0], r[2], r[3]));
  // Grashof (1883), strictly: a change point (s + l = p + q) does not turn fully.
  expect(s + l - (r[0] + r[1] + r[2] + r[3] - s - l)).toBeLessThan(0);
  if (untimed) {
    const theta = names.map((n, j) => (n.startsWith('theta2_') ? x[j] : NaN)).filter((t) => !Number.isNaN(t));
    for (let i = 1; i < theta.length; i++) expect(theta[i]).toBeGreaterThanOrEqual(theta[i - 1]);
  }
}

interface CaseSetup {
  id: string;
  wrap?: boolean;
  branch: 'open' | 'crossed' | 'either';
  /**
   * How close to reference_best the search must come: 1 % unless the case says why not.
   * closed18's reference_best is the best an independent implementation reached, not a
   * literature value, and its design sits on or just past the Grashof boundary. Loci
   * requires a full turn strictly (a change point, s + l = p + q, does not turn fully:
   * Grashof, 1883, as stated by Chang, Lin and Wu, 2005), and the best strictly Grashof
   * design found is 1.027 × reference_best (seeds 1 … 10 of the map's search; see above).
   */
  allowance?: number;
  /** The search map the problem file names (the problem and its reported design are unchanged); default 'affine'. */
  searchMap?: SearchMapKind;
  optimizer: Omit<HybridConfig, 'dim'>;
}

const CASES: CaseSetup[] = [
  {
    id: 'line6-untimed',
    wrap: false,
    branch: 'crossed',
    optimizer: { kind: 'hybrid', maxEvaluations: 600_000, seed: 2, globalShare: 0.5 },
  },
  {
    id: 'timed5',
    branch: 'open',
    optimizer: { kind: 'hybrid', maxEvaluations: 400_000, seed: 1, globalShare: 0.7 },
  },
  {
    id: 'closed18-untimed',
    wrap: false,
    branch: 'crossed',
    allowance: 1.03,
    searchMap: 'fourbar-boundary',
    optimizer: { kind: 'hybrid', maxEvaluations: 200_000, seed: 3 },
  },
];

describe('published four-bar path-synthesis benchmarks', () => {
  for (const setup of CASES) {
    it(`${setup.id} reaches reference_best within ${Math.round(((setup.allowance ?? 1.01) - 1) * 100)} %`, () => {
      const published = referenceCase(setup.id);
      const json = problemFile(setup.id);

      // The problem file is the published problem.
      const target = json.target as { points: number[][]; closed: boolean };
      expect(target.points).toEqual(published.points);
      expect(target.closed).toBe(published.closed);
      const timing = json.timing as { mode: string; driverValues?: number[]; unit?: string; wrap?: boolean };
      if (published.timing.prescribed) {
        expect(timing).toEqual({ mode: 'prescribed', driverValues: published.timing.angles_deg, unit: 'deg' });
      } else {
        expect(timing).toEqual({ mode: 'free', wrap: setup.wrap });
      }
      expect(json.measure).toBe('sum-of-squares');
      const boxes = (json.bounds as Record<string, Record<string, number[]>>)['fourbar-lengths'];
      const b = published.bounds;
      if (Array.isArray(b.r1_r4)) for (const n of ['r1', 'r2', 'r3', 'r4']) expect(boxes[n]).toEqual(b.r1_r4);
      if (Array.isArray(b.rcx_rcy_x0_y0)) for (const n of ['rcx', 'rcy', 'x0', 'y0']) expect(boxes[n]).toEqual(b.rcx_rcy_x0_y0);
      if (Array.isArray(b.theta0)) expect(boxes.theta0).toEqual(b.theta0);
      if (Array.isArray(b.theta2)) expect(boxes.theta2).toEqual(b.theta2);
      expect(json.constraints).toEqual({ fullTurnCrank: true, branch: setup.branch });

      const parsed = parseProblemFile(json);
      if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
      const objective = createObjective(parsed.problem, 'fourbar-lengths');
      expect(objective.searchMap).toBe(setup.searchMap ?? 'affine');
      expect(objective.dim).toBe(9 + (published.timing.prescribed ? 0 : published.points.length));

      const result = search(objective, setup.optimizer);
      const ratio = result.value / published.reference_best;
      console.log(
        `${setup.id}: value ${result.value.toExponential(6)} (${ratio.toFixed(4)} × reference_best ${published.reference_best}), ` +
          `${result.evaluations} evaluations, ${result.seconds.toFixed(2)} s, ${Math.round(result.evaluationsPerSecond)} evaluations/s; ` +
          `source: ${published.source}; confidence: ${JSON.stringify(published.confidence)}`,
      );
      expect(result.violation).toBe(0);
      expect(result.value).toBeLessThanOrEqual((setup.allowance ?? 1.01) * published.reference_best);

      checkPublishedConstraints(result.x, objective.variableNames, !published.timing.prescribed);
      const independent = sumOfSquaresThroughLinkage(objective, result.x, published.points);
      expect(Math.abs(independent - result.value)).toBeLessThanOrEqual(1e-9 * published.reference_best + 1e-24);
    });
  }
});
