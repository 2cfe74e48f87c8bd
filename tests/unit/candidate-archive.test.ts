/**
 * The one archive of distinct designs (src/core/synthesis/archive.ts), used by the
 * islands and by the run, against a brute-force model written here on its own: a plain
 * list, distances by the RMS formula with a square root, ranking by Deb's rules written
 * out, and the keeping rule applied by filtering and sorting the whole list. Seeded
 * streams of designs (clusters, exact repeats, ties, infeasible and failed ones) must give
 * the same answers and the same entries, bit for bit.
 */
import { describe, expect, it } from 'vitest';
import { Prng } from '../../src/core/optimize';
import { CandidateArchive, MAX_ARCHIVE_CAPACITY, mergeArchive } from '../../src/core/synthesis';

interface Design {
  readonly x: number[];
  readonly value: number;
  readonly violation: number;
}

// Source: Deb, 2000, "An efficient constraint handling method for genetic algorithms",
// rules (i)–(iii): feasible before infeasible, infeasible by violation, feasible by value.
function ranksBefore(a: Design, b: Design): boolean {
  const aFeasible = a.violation === 0;
  const bFeasible = b.violation === 0;
  if (aFeasible && bFeasible) return a.value < b.value;
  if (aFeasible !== bFeasible) return aFeasible;
  return a.violation < b.violation || (a.violation === b.violation && a.value < b.value);
}

/** RMS of the coordinate differences as shares of each span (a zero span counts nothing). */
function rms(a: readonly number[], b: readonly number[], lower: readonly number[], upper: readonly number[]): number {
  let sum = 0;
  for (let j = 0; j < a.length; j++) {
    const span = upper[j] - lower[j];
    if (span > 0) sum += ((a[j] - b[j]) / span) ** 2;
  }
  return Math.sqrt(sum / a.length);
}

/**
 * The keeping rule by brute force (common practice: a reference model that recomputes
 * everything from scratch at each step): a design enters unless a kept one within the
 * distance ranks at least as well; the kept ones within the distance go; the list is
 * re-sorted stably by rank with the newcomer after its equals, and cut to capacity.
 */
class ModelArchive {
  list: Design[] = [];
  constructor(
    readonly capacity: number,
    readonly distance: number,
    readonly lower: number[],
    readonly upper: number[],
  ) {}

  offer(d: Design): boolean {
    if (!(Number.isFinite(d.value) && Number.isFinite(d.violation) && d.violation >= 0)) return false;
    const near = this.list.filter((e) => rms(e.x, d.x, this.lower, this.upper) <= this.distance);
    if (near.some((e) => !ranksBefore(d, e))) return false;
    const rest = this.list.filter((e) => !near.includes(e));
    if (rest.length >= this.capacity && !ranksBefore(d, rest[rest.length - 1])) return false;
    // Stable insertion sort written out: the newcomer goes after every entry it does not rank before.
    const sorted = [...rest, d];
    for (let i = sorted.length - 1; i > 0 && ranksBefore(sorted[i], sorted[i - 1]); i--) [sorted[i - 1], sorted[i]] = [sorted[i], sorted[i - 1]];
    this.list = sorted.slice(0, this.capacity);
    return true;
  }
}

const LOWER = [0, -5, 10, 0];
const UPPER = [1, 5, 30, 0]; // the last variable is fixed: a zero span

/** Seeded designs: around a few centres (so many are near one another), with repeats, ties, infeasible and failed ones. */
function designs(seed: number, n: number, distance: number): Design[] {
  const prng = Prng.fromSeed(seed);
  const centres = Array.from({ length: 5 }, () => LOWER.map((lo, j) => lo + prng.float() * (UPPER[j] - lo)));
  const out: Design[] = [];
  for (let k = 0; k < n; k++) {
    const r = prng.float();
    if (r < 0.05 && out.length > 0) {
      out.push(out[Math.floor(prng.float() * out.length)]); // an exact repeat
      continue;
    }
    const c = centres[Math.floor(prng.float() * centres.length)];
    const spread = prng.float() < 0.5 ? distance : 0.2;
    const x = c.map((v, j) => Math.min(UPPER[j], Math.max(LOWER[j], v + (prng.float() - 0.5) * 2 * spread * (UPPER[j] - LOWER[j]))));
    const value = r < 0.1 ? 3 : Math.round(prng.float() * 1000) / 100; // 3 often, and values on a grid: ties
    const violation = r < 0.25 ? Math.round(prng.float() * 10) / 10 : 0;
    const failed = r > 0.97 ? [Number.NaN, Infinity, -Infinity][k % 3] : null;
    out.push({ x, value: failed ?? value, violation: r > 0.985 ? Number.NaN : violation });
  }
  return out;
}

function asDesigns(archive: CandidateArchive): Design[] {
  return archive.entries().map((e) => ({ x: Array.from(e.x), value: e.value, violation: e.violation }));
}

describe('the archive of distinct designs', () => {
  it('answers every offer and keeps the same entries as the brute-force model', () => {
    for (const [seed, capacity, distance] of [[1, 8, 0.05], [2, 1, 0.05], [3, 20, 0.2], [4, 5, 0], [5, 64, 0.01]] as const) {
      const archive = new CandidateArchive(capacity, distance, LOWER, UPPER);
      const model = new ModelArchive(capacity, distance, LOWER, UPPER);
      for (const [k, d] of designs(seed, 600, distance).entries()) {
        expect(archive.offer(d.x, d.value, d.violation), `seed ${seed}, offer ${k}`).toBe(model.offer(d));
      }
      expect(asDesigns(archive), `seed ${seed}`).toEqual(model.list);
    }
  });

  it('says it takes no infeasible design only where the model refuses every one (an island then stops such evaluations early)', () => {
    let refusing = 0;
    for (const [seed, capacity, distance] of [[6, 8, 0.05], [7, 3, 0.2], [8, 64, 0.01]] as const) {
      const archive = new CandidateArchive(capacity, distance, LOWER, UPPER);
      const model = new ModelArchive(capacity, distance, LOWER, UPPER);
      for (const d of designs(seed, 600, distance)) {
        if (!archive.takesInfeasible()) {
          refusing++;
          // The least violation there is, at the design's own place and at a fresh one.
          for (const x of [d.x, LOWER.map((lo, j) => (lo + UPPER[j]) / 2)]) {
            const probe = new ModelArchive(capacity, distance, LOWER, UPPER);
            probe.list = [...model.list];
            expect(probe.offer({ x, value: -1e300, violation: Number.MIN_VALUE })).toBe(false);
          }
        }
        archive.offer(d.x, d.value, d.violation);
        model.offer(d);
      }
    }
    expect(refusing).toBeGreaterThan(100);
  });

  it('holds at most its capacity, pairwise distinct, ranked, with the best offered design first', () => {
    const capacity = 12;
    const distance = 0.05;
    const archive = new CandidateArchive(capacity, distance, LOWER, UPPER);
    let best: Design | null = null;
    for (const [k, d] of designs(7, 2000, distance).entries()) {
      archive.offer(d.x, d.value, d.violation);
      const valid = Number.isFinite(d.value) && d.violation >= 0 && Number.isFinite(d.violation);
      if (valid && (best === null || ranksBefore(d, best))) best = d;
      const kept = asDesigns(archive);
      const faults: string[] = [];
      if (kept.length > capacity) faults.push(`${kept.length} entries`);
      // Source: theorem — nothing ranks strictly before the best design offered, so nothing can push it out.
      if (best !== null && kept[0] !== undefined && (kept[0].value !== best.value || kept[0].violation !== best.violation || kept[0].x.some((v, j) => v !== best?.x[j]))) faults.push('best not first');
      for (let i = 0; i < kept.length; i++) {
        if (i > 0 && ranksBefore(kept[i], kept[i - 1])) faults.push(`entry ${i} ranks before entry ${i - 1}`);
        for (let j = i + 1; j < kept.length; j++) if (!(rms(kept[i].x, kept[j].x, LOWER, UPPER) > distance)) faults.push(`entries ${i} and ${j} are not distinct`);
      }
      expect(faults, `after offer ${k}`).toEqual([]);
    }
  });

  it('merges several archives as one archive fed their entries in order', () => {
    const islands = [11, 12, 13].map((seed) => {
      const archive = new CandidateArchive(10, 0.05, LOWER, UPPER);
      for (const d of designs(seed, 300, 0.05)) archive.offer(d.x, d.value, d.violation);
      return archive;
    });
    const merged = mergeArchive(new CandidateArchive(10, 0.05, LOWER, UPPER), islands.map((a) => a.entries()));
    const model = new ModelArchive(10, 0.05, LOWER, UPPER);
    for (const island of islands) for (const d of asDesigns(island)) model.offer(d);
    expect(asDesigns(merged)).toEqual(model.list);
    // The best of the merge is the best of the islands' bests (common practice: the minimum of minima).
    const tops = islands.map((a) => asDesigns(a)[0]).sort((a, b) => (ranksBefore(a, b) ? -1 : ranksBefore(b, a) ? 1 : 0));
    expect(asDesigns(merged)[0]).toEqual(tops[0]);
  });

  it('keeps x exactly as offered, copied, and tells whether a design fits its bounds', () => {
    const archive = new CandidateArchive(4, 0.01, LOWER, UPPER);
    const x = [0.1 + 0.2, -1 / 3, 10 + Math.PI, 0];
    expect(archive.offer(x, 1, 0)).toBe(true);
    x[0] = 0.5;
    expect(Array.from(archive.entry(0).x)).toEqual([0.1 + 0.2, -1 / 3, 10 + Math.PI, 0]);
    expect(archive.fits([1, 5, 30, 0])).toBe(true);
    expect(archive.fits([1.01, 5, 30, 0])).toBe(false);
    expect(archive.fits([0.5, 0, 20])).toBe(false);
    expect(archive.fits([Number.NaN, 0, 20, 0])).toBe(false);
  });

  it('refuses a bad capacity or distance, saying what was expected', () => {
    expect(() => new CandidateArchive(0, 0.01, LOWER, UPPER)).toThrow(`archive capacity is 0; expected an integer in [1, ${MAX_ARCHIVE_CAPACITY}]`);
    expect(() => new CandidateArchive(4, Number.NaN, LOWER, UPPER)).toThrow('archive distance is NaN; expected a number in [0, 1] (box units)');
    expect(() => new CandidateArchive(4, 0.01, [0], [1, 2])).toThrow('archive bounds: 1 lower and 2 upper; expected one pair per variable');
  });
});
