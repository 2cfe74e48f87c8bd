/**
 * Describing designs without a search: the objective a spec names is built once (kept
 * while the same spec comes back), each design evaluated and described in full. This is
 * how the engine answers "what is this design?" for candidates read from a checkpoint.
 */
import { canonicalValue, canonicalViolation } from '../src/core/optimize';
import type { DescribedCandidate, ObjectiveSpec } from './api';
import { buildObjective } from './objective';
import type { SearchObjective } from './searchObjective';

/** Objectives kept per worker: a run has a few jobs, and each job keeps one spec. */
const CACHED_OBJECTIVES = 8;

export type DescribeOutcome = { readonly ok: true; readonly candidates: DescribedCandidate[] } | { readonly ok: false; readonly reason: string };

/** Each design (real coordinates) evaluated and described by `objective`; a bad design is refused by its index. */
export function describeWith(objective: SearchObjective, designs: unknown): DescribeOutcome {
  if (!Array.isArray(designs)) return { ok: false, reason: 'designs is not an array' };
  const out = new Float64Array(2);
  const candidates: DescribedCandidate[] = [];
  for (const [k, design] of designs.entries()) {
    if (!(Array.isArray(design) && design.length === objective.dim && design.every((v) => Number.isFinite(v)))) {
      return { ok: false, reason: `designs[${k}] is not an array of ${objective.dim} finite numbers` };
    }
    const x = Float64Array.from(design as number[]);
    try {
      objective.evaluate(x, out);
      const value = canonicalValue(out[0]);
      const violation = canonicalViolation(out[1], value);
      candidates.push({ x: Array.from(x), value, violation, detail: objective.describe(x) });
    } catch (error) {
      // A bug in an objective, not the caller's input: said as a value, with the design.
      const what = error instanceof Error ? `${error.name}: ${error.message}` : String(error);
      return { ok: false, reason: `describing designs[${k}] failed: ${what}` };
    }
  }
  return { ok: true, candidates };
}

/** A describer holding the objectives of the last few specs it was given. */
export function createDesignDescriber(): (spec: ObjectiveSpec, designs: unknown) => DescribeOutcome {
  const cache = new Map<string, SearchObjective>();
  return (spec, designs) => {
    const key = JSON.stringify(spec) ?? '';
    let objective = cache.get(key);
    if (objective === undefined) {
      const built = buildObjective(spec);
      if (!built.ok) return built;
      objective = built.objective;
      if (cache.size >= CACHED_OBJECTIVES) cache.delete(cache.keys().next().value as string);
      cache.set(key, objective);
    }
    return describeWith(objective, designs);
  };
}
