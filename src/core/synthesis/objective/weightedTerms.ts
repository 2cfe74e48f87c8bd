/**
 * Weighted, normalised terms, as the suspension and leg scores count them. Each term has
 * a deviation in its own unit and a tolerance in that unit (the deviation that counts as
 * 1). A target, or a band or limit set as a penalty, adds weight × (deviation /
 * tolerance)² to the value; one set as a constraint adds deviation / tolerance to a
 * violation slot, ranked first. A deviation that cannot be scored counts 1 into an
 * undefined slot instead. Resolved once per problem; summing allocates nothing.
 */

/** A term as a problem states it: `value` is its target figure, `as` how a band or limit counts. */
export interface TermSpec {
  readonly weight: number;
  readonly tolerance: number;
  readonly value?: number;
  readonly as?: 'constraint' | 'penalty';
}

export interface TermSlots {
  /** The violation slot an undefined deviation counts into. */
  readonly undefinedSlot: number;
  /** The violation slot constraint terms add into; absent when no term may be a constraint. */
  readonly constraintSlot?: number;
  /**
   * Which deviations cannot be scored: 'nan' only NaN (an infinite one scores, and the
   * value with it), or 'non-finite' anything not in [0, ∞).
   */
  readonly undefinedWhen: 'nan' | 'non-finite';
}

/** A problem's terms, resolved once: which are present and how each counts. */
export interface WeightedTerms {
  readonly present: Uint8Array;
  readonly weight: Float64Array;
  readonly tolerance: Float64Array;
  /** 0 target or penalty (value), 1 constraint (violation). */
  readonly constraint: Uint8Array;
  /** The target figure of each term that states one (`value`), else 0. */
  readonly target: Float64Array;
  /** Deviation of each term for the design scored last, in its unit. */
  readonly deviation: Float64Array;
  readonly slots: TermSlots;
}

/** The terms of `specs`, one a term index; an undefined spec is a term the problem leaves out. */
export function createWeightedTerms(specs: readonly (TermSpec | undefined)[], slots: TermSlots): WeightedTerms {
  const count = specs.length;
  const present = new Uint8Array(count);
  const weight = new Float64Array(count);
  const tolerance = new Float64Array(count).fill(1);
  const constraint = new Uint8Array(count);
  const target = new Float64Array(count);
  specs.forEach((term, i) => {
    if (term === undefined) return;
    present[i] = 1;
    weight[i] = term.weight;
    tolerance[i] = term.tolerance;
    target[i] = term.value ?? 0;
    constraint[i] = term.as === 'constraint' ? 1 : 0;
    if (constraint[i] === 1 && slots.constraintSlot === undefined) throw new Error(`weighted terms: term ${i} is a constraint but no constraint slot was given`);
  });
  return { present, weight, tolerance, constraint, target, deviation: new Float64Array(count), slots };
}

/** What term i adds for its current deviation: to the value (weight × n²) or, as a constraint, to the violation (n). */
export function termContribution(terms: WeightedTerms, i: number): number {
  const n = terms.deviation[i] / terms.tolerance[i];
  return terms.constraint[i] === 1 ? n : terms.weight[i] * n * n;
}

/** One report per present term, in term order, from its index, deviation and contribution. */
export function reportTerms<R>(terms: WeightedTerms, report: (i: number, deviation: number, contribution: number) => R): R[] {
  const out: R[] = [];
  for (let i = 0; i < terms.present.length; i++) if (terms.present[i] === 1) out.push(report(i, terms.deviation[i], termContribution(terms, i)));
  return out;
}

/**
 * Sums the present terms' deviations: returns the value, adds the constraint terms and
 * the count of undefined deviations into `parts` at the terms' slots.
 */
export function sumWeightedTerms(terms: WeightedTerms, parts: Float64Array): number {
  const { deviation, present, tolerance, weight, constraint, slots } = terms;
  const finiteOnly = slots.undefinedWhen === 'non-finite';
  let value = 0;
  for (let i = 0; i < deviation.length; i++) {
    if (present[i] === 0) continue;
    const d = deviation[i];
    if (finiteOnly ? !(d >= 0 && d < Infinity) : Number.isNaN(d)) {
      parts[slots.undefinedSlot] += 1;
      continue;
    }
    const n = d / tolerance[i];
    if (constraint[i] === 1) parts[slots.constraintSlot as number] += n;
    else value += weight[i] * n * n;
  }
  return value;
}
