/**
 * The engine's describer: designs described by the objective a spec names, in a worker
 * of its own (a real Node worker thread), are what the same objective says of them when
 * built in this thread: the worker boundary adds and loses nothing.
 */
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseProblemFile } from '../../src/core/io/problem';
import { createObjective } from '../../src/core/synthesis';
import { DesignDescriber } from '../../src/engine';
import { nodeEnvironment } from '../../src/engine/node';

const ROOT = resolve(import.meta.dirname, '../..');
const problemJson: unknown = JSON.parse(readFileSync(join(ROOT, 'tests/reference/problems/timed5.json'), 'utf8'));

describe('DesignDescriber', () => {
  const describer = new DesignDescriber(nodeEnvironment());
  afterAll(() => describer.close());

  it('describes designs as the objective does in this thread', async () => {
    const parsed = parseProblemFile(problemJson);
    if (!parsed.ok) throw new Error('timed5 does not parse');
    const objective = createObjective(parsed.problem, 'fourbar-lengths');
    const designs = [0.25, 0.5, 0.75].map((share) => Array.from(objective.lower, (lo, j) => lo + share * (objective.upper[j] - lo)));
    const answer = await describer.describe({ kind: 'synthesis', problem: problemJson, family: 'fourbar-lengths' }, designs);
    if (!answer.ok) throw new Error(answer.reason);
    expect(answer.candidates).toHaveLength(3);
    for (const [k, design] of designs.entries()) {
      const here = objective.describe(Float64Array.from(design));
      const there = answer.candidates[k];
      expect(there.detail).toEqual({ kind: 'synthesis', candidate: here });
      expect(there.value).toBe(here.value);
    }
  });

  it('says what is wrong with a bad spec or design, as a value', async () => {
    const badFamily = await describer.describe({ kind: 'synthesis', problem: problemJson, family: 'no-such' as never }, [[1]]);
    expect(badFamily.ok === false && badFamily.reason).toMatch(/family is "no-such"/);
    const badDesign = await describer.describe({ kind: 'synthesis', problem: problemJson, family: 'fourbar-lengths' }, [[1, 2]]);
    expect(badDesign.ok === false && badDesign.reason).toMatch(/designs\[0\] is not an array of \d+ finite numbers/);
  });

  it('answers { ok: false } once closed', async () => {
    const closed = new DesignDescriber(nodeEnvironment());
    closed.close();
    const answer = await closed.describe({ kind: 'test-function', name: 'rosenbrock', dim: 2 }, [[1, 1]]);
    expect(answer.ok).toBe(false);
  });
});
