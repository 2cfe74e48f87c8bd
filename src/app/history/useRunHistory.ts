/**
 * The run history of the project: every run that ends with designs (finished, stopped
 * or failed) is kept in IndexedDB with its settings, target and a name, so a new search
 * never takes the designs of an earlier one away. The user renames, shows and deletes
 * kept runs, and pins designs of any run to a shortlist that outlives runs and reloads.
 */
import { useCallback, useEffect, useRef, useState } from 'react';
import type { CandidateReport } from '../../core/synthesis';
import { familyName } from '../results/format';
import { useWorkspace } from '../state/store';
import type { LociDb } from '../storage';
import { deleteKeptRun, deletePin, getKeptRun, isKept, keepRun, listKeptRuns, listPins, putPin, renameKeptRun } from '../storage';
import { pinKeyOf, type KeptRun, type KeptRunSummary, type PinnedDesign } from './types';
import { onHistoryChanged, onShowKeptRun } from './historyEvents';
import type { TargetSnapshot } from '../state/project';

export interface RunHistory {
  readonly runs: readonly KeptRunSummary[];
  readonly pins: readonly PinnedDesign[];
  /** The kept run shown in the table instead of the current results, or null. */
  readonly shown: KeptRun | null;
  /** The id of the run whose results are the current ones (kept or not yet), or null. */
  readonly currentRunId: string | null;
  /** What went wrong with the storage last, for the user; null when all is well. */
  readonly problem: string | null;
  show(runId: string | null): void;
  rename(runId: string, name: string): void;
  remove(runId: string): void;
  pin(design: { readonly runId: string; readonly runName: string; readonly rank: number; readonly target: TargetSnapshot; readonly candidate: CandidateReport; readonly designKey: string }): void;
  unpin(pinKey: string): void;
}

/** The statuses after which a run's designs are final and kept. */
const ENDED = new Set(['finished', 'failed']);

/** "Run 3: four-bar, Watt I" */
export function defaultRunName(ordinal: number, candidates: readonly CandidateReport[]): string {
  const families = [...new Set(candidates.map((c) => c.family))].map(familyName);
  return `Run ${ordinal}: ${families.join(', ')}`;
}

type Loaded =
  | { readonly ok: true; readonly runs: KeptRunSummary[]; readonly pins: PinnedDesign[]; readonly unreadable: number }
  | { readonly ok: false; readonly reason: string };

async function load(db: LociDb): Promise<Loaded> {
  try {
    const [r, p] = await Promise.all([listKeptRuns(db), listPins(db)]);
    return { ok: true, runs: r.items, pins: p.items, unreadable: r.unreadable + p.unreadable };
  } catch (error) {
    return { ok: false, reason: message(error) };
  }
}

function message(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

export function useRunHistory(db: LociDb): RunHistory {
  const status = useWorkspace((s) => s.project.run.status);
  const runId = useWorkspace((s) => s.project.run.runId);
  const stopReason = useWorkspace((s) => s.project.run.stopReason);
  const evaluations = useWorkspace((s) => s.project.run.evaluations);
  const candidates = useWorkspace((s) => s.project.candidates);
  const candidatesTarget = useWorkspace((s) => s.project.candidatesTarget);
  const settings = useWorkspace((s) => s.project.settings);
  const [runs, setRuns] = useState<readonly KeptRunSummary[]>([]);
  const [pins, setPins] = useState<readonly PinnedDesign[]>([]);
  const [shown, setShown] = useState<KeptRun | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const keeping = useRef(new Set<string>());

  const apply = useCallback((loaded: Loaded) => {
    if (!loaded.ok) {
      setProblem(`The run history could not be read: ${loaded.reason}`);
      return;
    }
    setRuns(loaded.runs);
    setPins(loaded.pins);
    const n = loaded.unreadable;
    setProblem(n > 0 ? `${n} kept record${n === 1 ? '' : 's'} could not be read and ${n === 1 ? 'is' : 'are'} not shown.` : null);
  }, []);
  const reload = useCallback(() => load(db).then(apply), [db, apply]);

  useEffect(() => {
    let cancelled = false;
    void load(db).then((loaded) => {
      if (!cancelled) apply(loaded);
    });
    return () => {
      cancelled = true;
    };
  }, [db, apply]);

  // Runs kept elsewhere (a batch queue's jobs) join the list; a request to show one shows it.
  const showKept = useCallback((id: string) => {
    void getKeptRun(db, id).then(
      (run) => (run === null ? setProblem('That run could not be read back.') : setShown(run)),
      (error: unknown) => setProblem(`That run could not be read: ${message(error)}`),
    );
  }, [db]);
  useEffect(() => onHistoryChanged(() => void reload()), [reload]);
  useEffect(() => onShowKeptRun(showKept), [showKept]);

  // Keep the run once it has ended with designs (again after a reload, if it was not kept then).
  useEffect(() => {
    const target = candidatesTarget;
    if (runId === null || target === null || !ENDED.has(status) || candidates.length === 0 || keeping.current.has(runId)) return;
    keeping.current.add(runId);
    void (async () => {
      try {
        if (await isKept(db, runId)) return;
        const ordinal = (await listKeptRuns(db)).items.length + 1;
        await keepRun(db, {
          runId,
          name: defaultRunName(ordinal, candidates),
          keptAt: Date.now(),
          ended: status === 'failed' ? 'failed' : (stopReason ?? 'finished'),
          evaluations,
          settings,
          target,
          candidates,
        });
        await reload();
      } catch (error) {
        keeping.current.delete(runId);
        setProblem(`This run could not be kept: ${message(error)}`);
      }
    })();
  }, [db, runId, status, stopReason, evaluations, candidates, candidatesTarget, settings, reload]);

  const act = useCallback((what: string, work: () => Promise<unknown>) => {
    void work().then(reload, (error: unknown) => setProblem(`${what}: ${message(error)}`));
  }, [reload]);

  return {
    runs,
    pins,
    shown,
    currentRunId: runId,
    problem,
    show: (id) => {
      if (id === null) setShown(null);
      else showKept(id);
    },
    rename: (id, name) => {
      if (shown?.runId === id) setShown({ ...shown, name });
      act('The run could not be renamed', () => renameKeptRun(db, id, name));
    },
    remove: (id) => {
      if (shown?.runId === id) setShown(null);
      act('The run could not be deleted', () => deleteKeptRun(db, id));
    },
    pin: (design) => {
      const pin: PinnedDesign = {
        pinKey: pinKeyOf(design.runId, design.designKey),
        runId: design.runId,
        runName: design.runName,
        rank: design.rank,
        pinnedAt: Date.now(),
        target: design.target,
        candidate: design.candidate,
      };
      act('The design could not be pinned', () => putPin(db, pin));
    },
    unpin: (pinKey) => act('The design could not be unpinned', () => deletePin(db, pinKey)),
  };
}
