/**
 * A worker thread for the objective control of the scaling bench (plainThreads.ts): the
 * objective of one problem on designs drawn from one seed, with no optimizer, engine or
 * messages in between. Posts 'ready' once warmed up; on 'go' evaluates for the given
 * seconds and posts the evaluations done.
 */
import { performance } from 'node:perf_hooks';
import { parentPort, workerData } from 'node:worker_threads';
import { parseProblemFile } from '../src/core/io/problem';
import { Prng } from '../src/core/optimize/prng';
import { createObjective, type FamilyId } from '../src/core/synthesis';

interface ObjectiveThreadData {
  readonly problem: unknown;
  readonly family: FamilyId;
  readonly seed: number;
  readonly designs: number;
  readonly warmUpSeconds: number;
  readonly seconds: number;
}

const data = workerData as ObjectiveThreadData;
const port = parentPort;
if (port === null) throw new Error('objectiveThread: run as a worker thread');
const parsed = parseProblemFile(data.problem);
if (!parsed.ok) throw new Error('objectiveThread: the problem does not parse');
const objective = createObjective(parsed.problem, data.family);
const dim = objective.dim;
const prng = Prng.fromSeed(data.seed);
const designs = new Float64Array(data.designs * dim);
const u = new Float64Array(dim);
const x = new Float64Array(dim);
const out = new Float64Array(2);
for (let d = 0; d < data.designs; d++) {
  for (let j = 0; j < dim; j++) u[j] = prng.float();
  objective.fromSearchBoxInto(u, x);
  designs.set(x, d * dim);
}

let next = 0;

/** Evaluates the designs in turn for `seconds`; returns how many it evaluated. */
function evaluateFor(seconds: number): number {
  const end = performance.now() + 1000 * seconds;
  let evaluations = 0;
  // The clock read every 64 evaluations: one read per evaluation would cost more than the cheapest problems' evaluation.
  while (performance.now() < end) {
    for (let k = 0; k < 64; k++) {
      for (let j = 0; j < dim; j++) x[j] = designs[next * dim + j];
      objective.evaluate(x, out);
      next = next + 1 === data.designs ? 0 : next + 1;
    }
    evaluations += 64;
  }
  return evaluations;
}

evaluateFor(data.warmUpSeconds);
port.on('message', () => port.postMessage(evaluateFor(data.seconds)));
port.postMessage('ready');
