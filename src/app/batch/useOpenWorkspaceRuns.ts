/**
 * The page's side of "Open in its workspace" in the queue's summary: a rear-suspension
 * or walking-leg job's run, read back with that workspace's own schema, becomes the
 * workspace's latest run (the one before it kept as its previous, as after a search of
 * its own) in the project, and the workspace opens on it.
 */
import { useEffect } from 'react';
import type { LegProblemInput } from '../../core/synthesis/legProblem';
import { setupOfInput } from '../leg/demo';
import type { LegSearchRun } from '../leg/search/results';
import type { LegState } from '../leg/state';
import { storedLegSchema, type StoredLeg } from '../leg/stored';
import { storedSearchRecordSchema } from '../suspension/search/resultsSchema';
import { demoSuspensionState, reduceSuspension, type SuspensionState } from '../suspension/state';
import { stateOf, type StoredSuspension } from '../suspension/stored';
import { onOpenWorkspaceRun } from './openWorkspaceRun';

export interface OpenWorkspaceRunDeps {
  /** The designs the project keeps now (read when a run is opened). */
  readonly kept: () => { readonly suspension?: StoredSuspension; readonly leg?: StoredLeg } | undefined;
  readonly openSuspension: (state: SuspensionState) => void;
  readonly openLeg: (state: LegState) => void;
}

export function useOpenWorkspaceRuns({ kept, openSuspension, openLeg }: OpenWorkspaceRunDeps): void {
  useEffect(() => onOpenWorkspaceRun(({ kind, run }) => {
    const project = kept();
    if (kind === 'suspension') {
      const record = storedSearchRecordSchema.parse({ current: run, previous: null });
      if (record === undefined) return 'its designs do not read as a rear-suspension run (stored by another version of Loci?)';
      const base = project?.suspension === undefined ? demoSuspensionState() : stateOf(project.suspension);
      openSuspension(reduceSuspension(base, { type: 'searchFinished', run: record.current }));
      return null;
    }
    const saved = project?.leg;
    const setup = saved?.setup ?? setupOfInput(run.problem as LegProblemInput, run.budget, run.seed);
    const read = storedLegSchema.safeParse({ setup, results: { current: run, previous: saved?.results?.current ?? null } });
    if (!read.success) return 'its designs do not read as a walking-leg run (stored by another version of Loci?)';
    // Checked whole by the schema above; the run itself (not the schema's loose copy of its leg files) is kept.
    openLeg({ ...(saved ?? {}), setup, results: { current: run as LegSearchRun, previous: saved?.results?.current ?? null } });
    return null;
  }), [kept, openSuspension, openLeg]);
}
