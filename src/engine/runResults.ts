/**
 * A run's results: each job's archive of distinct designs (the merge of its islands'
 * archives in island order, taken at cuts), the best so far, and which designs the run
 * describes at its end, ranked over all jobs feasibility first (Deb, 2000).
 */
import { precedes } from '../core/optimize';
import { CandidateArchive, mergeArchive, type ArchiveEntry } from '../core/synthesis';
import type { IslandState } from '../../workers/api';
import type { RunSpec } from './runSpec';
import type { RunProgress } from './runTypes';

/** A design chosen to be described: its archive entry, its job and its rank over all jobs (1 for the best). */
export interface ChosenDesign {
  readonly entry: ArchiveEntry;
  readonly j: number;
  readonly rank: number;
}

export class JobArchives {
  /** Each job's archive at the last cut (null before its islands are placed). */
  private archives: (CandidateArchive | null)[];
  /** Real bounds of each job's variables, from its first island. */
  private readonly bounds = new Map<number, [number[], number[]]>();

  constructor(private readonly spec: RunSpec) {
    this.archives = spec.jobs.map(() => null);
  }

  /** The bounds of job j's variables, kept from the first island of it that is placed. */
  noteBounds(j: number, lower: number[], upper: number[]): void {
    if (!this.bounds.has(j)) this.bounds.set(j, [lower, upper]);
  }

  /**
   * Each job's archive: its islands' archives merged in island order (`jobOf(k)` is
   * island k's job). The islands checked their archives when they took their states, so
   * nothing here can fail.
   */
  merge(states: readonly Pick<IslandState, 'archive'>[], jobOf: (k: number) => number): void {
    const { capacity, distance } = this.spec.archive;
    this.archives = this.spec.jobs.map((_, j) => {
      const bounds = this.bounds.get(j);
      if (bounds === undefined) return null;
      const ofJob = states.filter((_, k) => jobOf(k) === j).map((state) => state.archive);
      return mergeArchive(new CandidateArchive(capacity, distance, bounds[0], bounds[1]), ofJob);
    });
  }

  /** Job j's entries at the last cut, best first. */
  entries(j: number): ArchiveEntry[] {
    return this.archives[j]?.entries() ?? [];
  }

  /**
   * Considers `value`/`violation` of job j against `best`, the best so far: the better,
   * first of equals kept (so in job order when called in job order).
   */
  static better(best: RunProgress['best'], jobId: string, value: number, violation: number): RunProgress['best'] {
    return best === null || precedes(value, violation, best.value, best.violation) ? { jobId, value, violation } : best;
  }

  /** The best of the archives at the last cut, first of equals in job order. */
  best(): RunProgress['best'] {
    let best: RunProgress['best'] = null;
    for (const [j, archive] of this.archives.entries()) {
      if (archive !== null && archive.size > 0) {
        const top = archive.entry(0);
        best = JobArchives.better(best, this.spec.jobs[j].id, top.value, top.violation);
      }
    }
    return best;
  }

  /**
   * The topK best designs of all jobs, then each job's own best (`ownBest` of them) that
   * the topK left out; all in the order of the whole pool, each with its rank there.
   */
  choose(topK: number, ownBest: number): ChosenDesign[] {
    const pool = this.archives.flatMap((archive, j) => (archive?.entries() ?? []).map((entry) => ({ entry, j })));
    pool.sort((a, b) =>
      precedes(a.entry.value, a.entry.violation, b.entry.value, b.entry.violation) ? -1
      : precedes(b.entry.value, b.entry.violation, a.entry.value, a.entry.violation) ? 1
      : a.j - b.j,
    );
    const takenOfJob = this.spec.jobs.map(() => 0);
    const chosen: ChosenDesign[] = [];
    for (const [k, c] of pool.entries()) {
      if (k < topK || takenOfJob[c.j] < ownBest) chosen.push({ ...c, rank: k + 1 });
      takenOfJob[c.j]++;
    }
    return chosen;
  }
}
