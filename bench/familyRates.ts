/**
 * Every family's objective on one fixed set of designs: the demo target (24 points,
 * closed, unprescribed timing, free placement, 180 curve samples), and for each family
 * designs drawn uniformly in its search box with one seed until DESIGNS_PER_KIND that the
 * objective calls feasible and as many it does not are kept. Each family then evaluates
 * its set, untimed WARM_UP_PASSES times, then once per round, the families taken in turn
 * within a round so that a change of the machine's speed falls on all of them; the rate
 * is the median round's, per second of this process's CPU (one thread).
 *
 * The families bench measures the same rates inside a search, where the designs are the
 * optimizer's, so a family whose search wanders into costlier designs shows a lower rate
 * there; here every family's figure is one of the same kind of designs, fixed, so the
 * ratios to the four-bar (#13's goal for the six-bars: 0.5) move only with the code.
 */
import { parseProblemFile } from '../src/core/io/problem';
import { Prng } from '../src/core/optimize/prng';
import { FAMILY_IDS, createObjective, type FamilyId } from '../src/core/synthesis';
import { demoProblemFile } from './demoProblem';

const SAMPLES = 180;
const SEED = 11;
const DESIGNS_PER_KIND = 200;
/** Designs drawn at most per family: far more than the feasible share of any family needs. */
const MAX_DRAWS = 200_000;
const WARM_UP_PASSES = 2;
const ROUNDS = 5;
/** The ratio's denominator: the pose four-bar, whose encoding the six-bars share. */
const REFERENCE_FAMILY: FamilyId = 'fourbar';

export interface DesignSet {
  readonly family: FamilyId;
  readonly evaluate: (x: Float64Array, out: Float64Array) => void;
  readonly dim: number;
  readonly designs: Float64Array;
  readonly count: number;
  readonly draws: number;
}

function cpuSeconds(): number {
  const used = process.cpuUsage();
  return (used.user + used.system) / 1e6;
}

/** The family's fixed designs: DESIGNS_PER_KIND the objective calls feasible and as many it does not. */
export function drawDesigns(family: FamilyId): DesignSet {
  const parsed = parseProblemFile(demoProblemFile(family, SAMPLES));
  if (!parsed.ok) throw new Error(`bench: the demo problem does not parse for ${family}`);
  const objective = createObjective(parsed.problem, family);
  const dim = objective.dim;
  const prng = Prng.fromSeed(SEED);
  const u = new Float64Array(dim);
  const x = new Float64Array(dim);
  const out = new Float64Array(2);
  const designs = new Float64Array(2 * DESIGNS_PER_KIND * dim);
  let feasible = 0;
  let infeasible = 0;
  let draws = 0;
  while ((feasible < DESIGNS_PER_KIND || infeasible < DESIGNS_PER_KIND) && draws < MAX_DRAWS) {
    draws++;
    for (let j = 0; j < dim; j++) u[j] = prng.float();
    objective.fromSearchBoxInto(u, x);
    // Written before it is evaluated; a draw not kept is overwritten by the next.
    designs.set(x, (feasible + infeasible) * dim);
    objective.evaluate(x, out);
    if (out[1] <= 0) {
      if (feasible < DESIGNS_PER_KIND) feasible++;
    } else if (infeasible < DESIGNS_PER_KIND) {
      infeasible++;
    }
  }
  const count = feasible + infeasible;
  return { family, evaluate: (d, o) => objective.evaluate(d, o), dim, designs: designs.subarray(0, count * dim), count, draws };
}

/** One pass over the set; returns CPU seconds. */
function pass(set: DesignSet, x: Float64Array, out: Float64Array): number {
  const start = cpuSeconds();
  for (let d = 0; d < set.count; d++) {
    for (let j = 0; j < set.dim; j++) x[j] = set.designs[d * set.dim + j];
    set.evaluate(x, out);
  }
  return cpuSeconds() - start;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

export function benchFamilyRates(): Promise<Record<string, number | string | null>[]> {
  const sets = FAMILY_IDS.map(drawDesigns);
  const scratch = sets.map((s) => ({ x: new Float64Array(s.dim), out: new Float64Array(2) }));
  sets.forEach((set, k) => {
    for (let r = 0; r < WARM_UP_PASSES; r++) pass(set, scratch[k].x, scratch[k].out);
  });
  const seconds = sets.map(() => [] as number[]);
  for (let round = 0; round < ROUNDS; round++) {
    sets.forEach((set, k) => seconds[k].push(pass(set, scratch[k].x, scratch[k].out)));
  }
  const rates = sets.map((set, k) => set.count / median(seconds[k]));
  const reference = rates[sets.findIndex((s) => s.family === REFERENCE_FAMILY)];
  return Promise.resolve(
    sets.map((set, k) => ({
      family: set.family,
      designs: set.count,
      draws: set.draws,
      evalsPerCpuS: rates[k],
      evalsPerCpuSOverFourbarRatio: rates[k] / reference,
      slowestOverFastestRound: Math.max(...seconds[k]) / Math.min(...seconds[k]),
    })),
  );
}
