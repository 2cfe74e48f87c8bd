/**
 * The suspension side view's traced image: its record (which image, where it lies in
 * bicycle mm, how it is shown) beside the current project, its bytes in the images store.
 * Read back as `unknown`: the trace module checks its shape.
 */
import { CURRENT_PROJECT_KEY, type LociDb } from './db';

export const TRACE_RECORD_KEY = `${CURRENT_PROJECT_KEY}:suspension-trace`;

export async function loadTraceRecord(db: LociDb): Promise<unknown> {
  return db.get('projects', TRACE_RECORD_KEY);
}

export async function saveTraceRecord(db: LociDb, record: unknown): Promise<void> {
  await db.put('projects', record, TRACE_RECORD_KEY);
}

export async function deleteTraceRecord(db: LociDb): Promise<void> {
  await db.delete('projects', TRACE_RECORD_KEY);
}
