/**
 * Starting the workspace: open storage, read the project back (or open the demo on a
 * first start), keep saving it as it changes, and resume a search a reload interrupted.
 */
import { pageEnvironment } from '../engine/browser';
import { createDemoProject } from './demo/demoProject';
import { SearchController } from './run/searchController';
import { INITIAL_UI, type Notice } from './state/reducer';
import { createStore, type Store } from './state/store';
import { createProjectSaver, loadProject, openLociDb, type LociDb } from './storage';

export interface Workspace {
  readonly store: Store;
  readonly controller: SearchController;
  readonly db: LociDb | null;
  /** Workers a search uses when the settings say "auto". */
  readonly defaultWorkers: number;
}

/** The lock a search holds while it runs (a queued job takes it too, src/app/batch). */
export const RUN_LOCK = 'loci-search';
/** A reloaded page waits this long for the page it replaces to let go of the lock, ms. */
const RUN_LOCK_WAIT_MS = 5000;

function holdRunLock(released: Promise<void>): Promise<boolean> {
  const locks = (navigator as Partial<Navigator>).locks;
  if (locks === undefined) return Promise.resolve(true);
  return new Promise((resolve) => {
    locks
      .request(RUN_LOCK, { signal: AbortSignal.timeout(RUN_LOCK_WAIT_MS) }, () => {
        resolve(true);
        return released;
      })
      .catch(() => resolve(false));
  });
}

function newRunId(): string {
  return `run-${Date.now().toString(36)}-${crypto.randomUUID().slice(0, 8)}`;
}

let booting: Promise<Workspace> | null = null;

/** The page's one workspace (a second mount, as React's StrictMode does in development, gets the same). */
export function bootWorkspace(): Promise<Workspace> {
  booting ??= boot();
  return booting;
}

async function boot(): Promise<Workspace> {
  let db: LociDb | null;
  let notice: Notice | null = null;
  let project = null;
  try {
    db = await openLociDb();
    const read = await loadProject(db);
    if (read !== null && read.ok) project = read.project;
    else if (read !== null) notice = { kind: 'error', title: 'The saved project could not be opened; the demo is open instead', lines: [read.reason] };
  } catch (error) {
    db = null;
    notice = {
      kind: 'error',
      title: 'This browser keeps no storage for Loci (private window?): work is not saved across reloads',
      lines: [error instanceof Error ? error.message : String(error)],
    };
  }
  const store = createStore({
    project: project ?? createDemoProject(),
    ui: { ...INITIAL_UI, storage: db === null ? 'unavailable' : 'ready', targetNotice: notice },
  });

  if (db !== null) {
    const saver = createProjectSaver(db, (error) =>
      store.dispatch({ type: 'target/notice', notice: { kind: 'error', title: 'Saving the project failed', lines: [error instanceof Error ? error.message : String(error)] } }),
    );
    let saved = store.getState().project;
    if (project === null) saver.changed(saved);
    store.subscribe(() => {
      const now = store.getState().project;
      if (now === saved) return;
      // A search starting, pausing or ending, and new candidates, are written straight
      // away (a reload a moment later must not find a finished search still marked as
      // running), in a task after the re-render the change causes, not inside it.
      const urgent = now.run.status !== saved.run.status || now.candidates !== saved.candidates || now.run.checkpoint !== saved.run.checkpoint;
      saved = now;
      saver.changed(now);
      if (urgent) setTimeout(() => void saver.flush(), 0);
    });
    // A page being hidden may be a page being closed: write what is pending.
    document.addEventListener('visibilitychange', () => {
      if (document.visibilityState === 'hidden') void saver.flush();
    });
  }

  const env = pageEnvironment();
  const controller = new SearchController(store, { env, db, wallNow: () => Date.now(), newRunId, holdRunLock });
  void controller.restoreAfterReload();
  return { store, controller, db, defaultWorkers: env.defaultWorkerCount() };
}
