/**
 * A kept run and a pinned design, as they are stored in IndexedDB (src/app/storage/runHistoryStore.ts).
 * A run keeps what it found, what it searched for and how: enough to show, compare and
 * export its designs after later runs and reloads.
 */
import type { CandidateReport } from '../../core/synthesis';
import type { SearchSettings, TargetSnapshot } from '../state/project';

export interface KeptRun {
  readonly runId: string;
  /** The user's name for it; "Run 3: four-bar, Watt I" until renamed. */
  readonly name: string;
  /** Wall-clock time it was kept, ms since 1970. */
  readonly keptAt: number;
  /** Why it ended: the engine's stop reason, or 'failed'. */
  readonly ended: string;
  readonly evaluations: number;
  readonly settings: SearchSettings;
  readonly target: TargetSnapshot;
  /** Ranked best first, as the run gave them. */
  readonly candidates: readonly CandidateReport[];
}

/** What the run list shows without reading every run's candidates. */
export interface KeptRunSummary {
  readonly runId: string;
  readonly name: string;
  readonly keptAt: number;
  readonly ended: string;
  readonly evaluations: number;
  readonly families: readonly string[];
  readonly designs: number;
  /** Best RMS error, mm, of the feasible designs (of all, when none is feasible); null with none. */
  readonly bestRmsMm: number | null;
}

export interface PinnedDesign {
  /** Run id and the design's key (family and design vector). */
  readonly pinKey: string;
  readonly runId: string;
  readonly runName: string;
  /** Its rank in its run. */
  readonly rank: number;
  readonly pinnedAt: number;
  readonly target: TargetSnapshot;
  readonly candidate: CandidateReport;
}

export function pinKeyOf(runId: string, designKey: string): string {
  return `${runId}|${designKey}`;
}

export function summaryOf(run: KeptRun): KeptRunSummary {
  const feasible = run.candidates.filter((c) => c.feasible);
  const pool = feasible.length > 0 ? feasible : run.candidates;
  let best: number | null = null;
  for (const c of pool) if (Number.isFinite(c.error.rmsMm) && (best === null || c.error.rmsMm < best)) best = c.error.rmsMm;
  return {
    runId: run.runId,
    name: run.name,
    keptAt: run.keptAt,
    ended: run.ended,
    evaluations: run.evaluations,
    families: [...new Set(run.candidates.map((c) => c.family))],
    designs: run.candidates.length,
    bestRmsMm: best,
  };
}
