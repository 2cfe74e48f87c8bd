/**
 * Run by tests/unit/island-allocation.test.ts in a process of its own: the least bytes
 * per evaluation of an island's step on the published line6 problem, over windows after a
 * warm-up, for the search named by the first argument; with "boxed" as the second, the
 * objective is wrapped to box two doubles per evaluation (the control). Prints a number.
 */
import { readFileSync } from 'node:fs';
import { allocatedBytes } from './allocatedBytes';
import type { IslandConfig } from '../../workers/api';
import { Island } from '../../workers/island';
import { buildObjective } from '../../workers/objective';

const problem: unknown = JSON.parse(readFileSync(new URL('../reference/problems/line6-untimed.json', import.meta.url), 'utf8'));

const WINDOW_EVALUATIONS = 2_000;
/** Windows measured after the warm-up; a window that holds a restart (a new run's buffers) or a recompilation is not the quietest. */
const MAX_WINDOWS = 30;
const WARM_UP_EVALUATIONS = 10_000;

function configFor(kind: string): IslandConfig {
  return {
    islandId: kind,
    seed: 5,
    stream: 0,
    maxEvaluations: 10_000_000,
    archiveCapacity: 64,
    archiveDistance: 0.01,
    optimizer: { kind },
    objective: { kind: 'synthesis', problem, family: 'fourbar-lengths' },
  } as IslandConfig;
}

/** The least bytes per evaluation of the island's step over MAX_WINDOWS windows. */
function quietestBytesPerEvaluation(island: Island): number {
  const now = (): number => 0;
  island.step({ evaluations: WARM_UP_EVALUATIONS }, now);
  let least = Infinity;
  for (let w = 0; w < MAX_WINDOWS; w++) {
    let told = 0;
    const bytes = allocatedBytes(() => {
      told = island.step({ evaluations: WINDOW_EVALUATIONS }, now).stepEvaluations;
    });
    if (told > 0) least = Math.min(least, bytes / told);
  }
  return least;
}


function island(kind: string, boxed: boolean): Island {
  // Boxed: the objective keeps its value and violation in an array of any elements, which
  // holds each double it is given as a heap number of its own: two per evaluation.
  const box: unknown[] = ['', ''];
  const made = !boxed ? Island.create(configFor(kind)) : Island.create(configFor(kind), (spec) => {
    const built = buildObjective(spec);
    if (!built.ok) return built;
    const real = built.objective;
    const objective = Object.create(real) as typeof real;
    objective.evaluate = (x: Float64Array, out: Float64Array): void => {
      real.evaluate(x, out);
      box[0] = out[0] + 0.5;
      box[1] = out[1] + 0.25;
    };
    return { ...built, objective };
  });
  if (!made.ok) throw new Error(made.reason);
  return made.island;
}

process.stdout.write(String(quietestBytesPerEvaluation(island(process.argv[2] ?? 'lshade', process.argv[3] === 'boxed'))));
