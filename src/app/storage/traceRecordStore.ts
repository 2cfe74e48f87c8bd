/**
 * A workspace's traced image: its record (which image, where it lies in the workspace's
 * mm, how it is shown) beside the current project under the workspace's own key, its
 * bytes in the images store. Read back as `unknown`: the trace module checks its shape.
 */
import { CURRENT_PROJECT_KEY, type LociDb } from './db';

/** The suspension side view's traced image. */
export const TRACE_RECORD_KEY = `${CURRENT_PROJECT_KEY}:suspension-trace`;
/** The image the walking leg's foot trajectory is traced over. */
export const LEG_TRACE_RECORD_KEY = `${CURRENT_PROJECT_KEY}:leg-trace`;

export async function loadTraceRecord(db: LociDb, key: string = TRACE_RECORD_KEY): Promise<unknown> {
  return db.get('projects', key);
}

export async function saveTraceRecord(db: LociDb, record: unknown, key: string = TRACE_RECORD_KEY): Promise<void> {
  await db.put('projects', record, key);
}

export async function deleteTraceRecord(db: LociDb, key: string = TRACE_RECORD_KEY): Promise<void> {
  await db.delete('projects', key);
}
