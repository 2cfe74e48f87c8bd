/** Reading the project back, and saving it as it changes: debounced, at most every few seconds under steady change. */
import { CURRENT_PROJECT_KEY, type LociDb } from './db';
import { readProject, type ReadProject } from './projectSchema';
import type { Project } from '../state/project';

/** Wait this long after the last change before saving, ms. */
export const SAVE_DELAY_MS = 400;
/** But never longer than this while changes keep coming (a running search), ms. */
export const SAVE_MAX_WAIT_MS = 2000;

export async function loadProject(db: LociDb): Promise<ReadProject | null> {
  const value = await db.get('projects', CURRENT_PROJECT_KEY);
  if (value === undefined) return null;
  return readProject(value);
}

export function saveProject(db: LociDb, project: Project): Promise<void> {
  return db.put('projects', project, CURRENT_PROJECT_KEY).then(() => undefined);
}

export interface ProjectSaver {
  /** Notes a change; the project is saved after a pause in changes. */
  changed(project: Project): void;
  /** Saves a pending change now. */
  flush(): Promise<void>;
}

export function createProjectSaver(db: LociDb, onError: (error: unknown) => void): ProjectSaver {
  let pending: Project | null = null;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let firstChangeAt = 0;
  let writing: Promise<void> = Promise.resolve();

  const write = (): Promise<void> => {
    if (timer !== null) clearTimeout(timer);
    timer = null;
    const project = pending;
    pending = null;
    if (project === null) return writing;
    // Writes go one after another, so an older project never lands after a newer one.
    writing = writing.then(() => saveProject(db, project)).catch(onError);
    return writing;
  };

  return {
    changed(project) {
      const now = performance.now();
      if (pending === null) firstChangeAt = now;
      pending = project;
      if (timer !== null) clearTimeout(timer);
      const wait = Math.max(0, Math.min(SAVE_DELAY_MS, firstChangeAt + SAVE_MAX_WAIT_MS - now));
      timer = setTimeout(() => void write(), wait);
    },
    flush: write,
  };
}
