/**
 * Suspension metrics against the pose solves they come from, per demo layout: suspension
 * evaluations per second (60 travel steps, every metric, the demo bicycle's coil spring
 * so the wheel rate too) beside, in the same run, sweeps of the same layout over the same
 * 60 shock lengths (poses and exact rates, what the metrics read) and plain pose solves
 * (60 `run` calls). An evaluation is a prepared evaluator's (prepareSuspension: the
 * bicycle checked, the layout compiled and the arrays allocated once), which sweeps the
 * stroke itself. The goal: an evaluation costs no more than 3 sweeps
 * (`evalOverSweepTimeRatio` ≤ 3). Beside it, the one-shot call (suspensionCurves:
 * checks, compile and allocation every time), to show what the preparation costs,
 * measured after every layout's evaluations.
 *
 * Untimed warm-up, then many short interleaved rounds timed by this process's CPU time
 * (rates per CPU second: the machine is shared, and the wall clock counts the waits for
 * a core too). Each rate is the best round's; each ratio the median of the ratios within
 * a round. Results fold into checksums reported outside the timed regions.
 */
import { compile, run as runImport, sweep as sweepImport, type Linkage, type Plan } from '../src/core/linkage';
import {
  DEMO_LAYOUTS,
  DEMO_TRAIL_BIKE,
  fourBarSeatStayAxle,
  linkageDrivenSinglePivot,
  shortLinkFourBar,
  singlePivot,
  stephensonSixBar,
  suspensionCurves as suspensionCurvesImport,
  wattSixBar,
} from '../src/core/suspension';
import { prepareSuspension, type SuspensionEvaluator } from '../src/core/suspension';

// Hot loops call module-local functions: tsx turns imported bindings into getters (see bench/README.md).
const run = runImport;
const sweep = sweepImport;
const suspensionCurves = suspensionCurvesImport;

const STEPS = 60;
/** Many short rounds: on the shared machine a round that a load spike falls on is one of many. */
const ROUNDS = 15;
/** Untimed rounds first, so that the JIT has compiled the hot code before any is timed. */
const WARM_UP_ROUNDS = 5;
/** Work per timed round, a few milliseconds each: evaluations take several times longer than sweeps, so fewer of them. */
const SWEEPS_PER_ROUND = 40;
const EVALS_PER_ROUND = 15;
const ONE_SHOTS_PER_ROUND = 5;
const RUN_SWEEPS_PER_ROUND = 400;
/** The goal from the issue: a full evaluation costs at most this many sweeps. */
export const EVAL_OVER_SWEEP_GOAL = 3;

const LAYOUTS: readonly (readonly [string, Linkage])[] = [
  ['singlePivot', singlePivot(DEMO_LAYOUTS.singlePivot)],
  ['linkageDrivenSinglePivot', linkageDrivenSinglePivot(DEMO_LAYOUTS.linkageDrivenSinglePivot)],
  ['fourBarSeatStayAxle', fourBarSeatStayAxle(DEMO_LAYOUTS.fourBarSeatStayAxle)],
  ['shortLinkFourBar', shortLinkFourBar(DEMO_LAYOUTS.shortLinkFourBar)],
  ['wattSixBar', wattSixBar(DEMO_LAYOUTS.wattSixBar)],
  ['stephensonSixBar', stephensonSixBar(DEMO_LAYOUTS.stephensonSixBar)],
];

const FROM_MM = DEMO_TRAIL_BIKE.shock.eyeToEyeMm;
const TO_MM = FROM_MM - DEMO_TRAIL_BIKE.shock.strokeMm;

function evalLoop(evaluator: SuspensionEvaluator, count: number): number {
  let acc = 0;
  for (let i = 0; i < count; i++) {
    const r = evaluator.evaluate();
    if (!r.ok) throw new Error(`bench: ${r.reason}`);
    acc += r.report.curves.leverageRatio[STEPS - 1] + r.report.sagPoint.antiSquatPct[0];
  }
  return acc;
}

function oneShotLoop(linkage: Linkage, count: number): number {
  let acc = 0;
  for (let i = 0; i < count; i++) {
    const r = suspensionCurves(linkage, DEMO_TRAIL_BIKE, { steps: STEPS });
    if (!r.ok) throw new Error(`bench: ${r.reason}`);
    acc += r.report.curves.leverageRatio[STEPS - 1] + r.report.sagPoint.antiSquatPct[0];
  }
  return acc;
}

function sweepLoop(plan: Plan, axleAt: number, count: number): number {
  let acc = 0;
  for (let i = 0; i < count; i++) {
    const sw = sweep(plan, { from: FROM_MM, to: TO_MM, steps: STEPS });
    acc += sw.poses[(STEPS - 1) * 2 * plan.slotCount + axleAt + 1] + sw.rates[axleAt + 1];
  }
  return acc;
}

function runLoop(plan: Plan, axleAt: number, count: number, pose: Float64Array): number {
  let acc = 0;
  const step = (TO_MM - FROM_MM) / (STEPS - 1);
  for (let i = 0; i < count; i++) {
    pose.set(plan.reference);
    for (let k = 0; k < STEPS; k++) {
      if (!run(plan, FROM_MM + k * step, pose)) throw new Error('bench: a pose solve failed inside the stroke');
    }
    acc += pose[axleAt + 1];
  }
  return acc;
}

/** This process's CPU time, s: on a shared, loaded machine the wall clock also counts the time spent waiting for a core. */
function cpuS(): number {
  const used = process.cpuUsage();
  return (used.user + used.system) / 1e6;
}

interface Timed {
  /** Best rate per CPU second over the rounds. */
  perS: number;
  /** The rate in each round. */
  readonly rounds: number[];
  checksum: number;
}

/** Timed rounds of several loops, interleaved so that load on the shared machine falls on all alike. */
function interleaved(loops: readonly { readonly count: number; readonly body: () => number }[]): Timed[] {
  const out: Timed[] = loops.map(() => ({ perS: 0, rounds: [], checksum: 0 }));
  for (let r = 0; r < WARM_UP_ROUNDS; r++) loops.forEach((loop, i) => (out[i].checksum = loop.body()));
  for (let r = 0; r < ROUNDS; r++) {
    loops.forEach((loop, i) => {
      const t0 = cpuS();
      out[i].checksum = loop.body();
      const perS = loop.count / (cpuS() - t0);
      out[i].rounds.push(perS);
      out[i].perS = Math.max(out[i].perS, perS);
    });
  }
  return out;
}

/**
 * How many times longer one `slow` takes than one `fast`: the median over the rounds of
 * the ratio within each round, whose two loops ran a moment apart. On a loaded machine
 * the best rates of two loops can come from rounds that met different load; the ratio
 * within a round cannot.
 */
function timeRatio(slow: Timed, fast: Timed): number {
  const ratios = slow.rounds.map((perS, r) => fast.rounds[r] / perS).sort((a, b) => a - b);
  const mid = ratios.length >> 1;
  return ratios.length % 2 === 1 ? ratios[mid] : 0.5 * (ratios[mid - 1] + ratios[mid]);
}

interface Prepared {
  readonly layout: string;
  readonly linkage: Linkage;
  readonly plan: Plan;
  readonly axleAt: number;
  readonly evaluator: SuspensionEvaluator;
}

function prepare(layout: string, linkage: Linkage): Prepared {
  const compiled = compile(linkage);
  if (!compiled.ok) throw new Error(`bench: ${layout} does not compile`);
  const plan = compiled.plan;
  const prepared = prepareSuspension(linkage, DEMO_TRAIL_BIKE, { steps: STEPS });
  if (!prepared.ok) throw new Error(`bench: ${layout}: ${prepared.reason}`);
  return { layout, linkage, plan, axleAt: 2 * (plan.slotIndex.get('axle') ?? -1), evaluator: prepared.evaluator };
}

export async function benchSuspension(): Promise<Record<string, number | string>[]> {
  const layouts = LAYOUTS.map(([layout, linkage]) => prepare(layout, linkage));
  // Every layout's evaluations and sweeps first; the one-shot calls compile a plan each
  // time, whose generated kernels would otherwise make the solver's call sites polymorphic
  // under the later layouts' figures.
  const measured = layouts.map(({ plan, axleAt, evaluator }) => {
    const pose = new Float64Array(2 * plan.slotCount);
    const [evals, sweeps, runs] = interleaved([
      { count: EVALS_PER_ROUND, body: () => evalLoop(evaluator, EVALS_PER_ROUND) },
      { count: SWEEPS_PER_ROUND, body: () => sweepLoop(plan, axleAt, SWEEPS_PER_ROUND) },
      { count: RUN_SWEEPS_PER_ROUND, body: () => runLoop(plan, axleAt, RUN_SWEEPS_PER_ROUND, pose) },
    ]);
    return { evals, sweeps, runs };
  });
  const rows: Record<string, number | string>[] = layouts.map(({ layout, linkage, plan, axleAt }, i) => {
    const { evals, sweeps, runs } = measured[i];
    const [oneShots, sweepsAgain] = interleaved([
      { count: ONE_SHOTS_PER_ROUND, body: () => oneShotLoop(linkage, ONE_SHOTS_PER_ROUND) },
      { count: SWEEPS_PER_ROUND, body: () => sweepLoop(plan, axleAt, SWEEPS_PER_ROUND) },
    ]);
    return {
      layout,
      steps: STEPS,
      evalsPerCpuS: evals.perS,
      sweepsPerCpuS: sweeps.perS,
      plainSolveSweepsPerCpuS: runs.perS,
      evalOverSweepTimeRatio: timeRatio(evals, sweeps),
      evalOverPlainSolvesTimeRatio: timeRatio(evals, runs),
      goalEvalOverSweepMax: EVAL_OVER_SWEEP_GOAL,
      oneShotsPerCpuS: oneShots.perS,
      oneShotOverSweepTimeRatio: timeRatio(oneShots, sweepsAgain),
      evalChecksum: evals.checksum,
      sweepChecksum: sweeps.checksum,
      plainSolveChecksum: runs.checksum,
      oneShotChecksum: oneShots.checksum,
    };
  });
  await Promise.resolve();
  return rows;
}
