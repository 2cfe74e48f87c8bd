/**
 * A workspace search's checkpoints in the app's IndexedDB, read and damaged from inside
 * the page: run ids start with the workspace's scope (`suspension-…`, `leg-…`).
 */
import type { Page } from 'playwright-core';

export interface StoredCheckpoint {
  readonly runId: string;
  readonly seq: number;
  /** The evaluations its payload records; null where its text is not JSON. */
  readonly evaluations: number | null;
}

/** The checkpoints of the runs whose id starts with `scope-`. */
export function storedCheckpoints(page: Page, scope: string): Promise<StoredCheckpoint[]> {
  return page.evaluate((prefix) => new Promise<StoredCheckpoint[]>((resolve) => {
    const open = indexedDB.open('loci');
    open.onsuccess = () => {
      const db = open.result;
      const all = db.transaction('checkpoints', 'readonly').objectStore('checkpoints').getAll();
      all.onsuccess = () => {
        db.close();
        const records = all.result as { runId: string; seq: number; text: string }[];
        resolve(records.filter((r) => r.runId.startsWith(prefix)).map((r) => {
          let evaluations: number | null;
          try {
            evaluations = (JSON.parse(r.text) as { payload: { evaluations: number } }).payload.evaluations;
          } catch {
            evaluations = null;
          }
          return { runId: r.runId, seq: r.seq, evaluations };
        }));
      };
      all.onerror = () => resolve([]);
    };
    open.onerror = () => resolve([]);
  }), `${scope}-`);
}

/** Changes the newest checkpoint's evaluation count (runs `scope-…`) under its unchanged checksum: a damaged write. */
export function damageNewestCheckpoint(page: Page, scope: string): Promise<boolean> {
  return page.evaluate((prefix) => new Promise<boolean>((resolve) => {
    const open = indexedDB.open('loci');
    open.onsuccess = () => {
      const db = open.result;
      const tx = db.transaction('checkpoints', 'readwrite');
      const store = tx.objectStore('checkpoints');
      const all = store.getAll();
      let done = false;
      all.onsuccess = () => {
        const records = (all.result as { runId: string; seq: number; text: string }[]).filter((r) => r.runId.startsWith(prefix)).sort((a, b) => b.seq - a.seq);
        if (records.length === 0) return;
        const doc = JSON.parse(records[0].text) as { payload: { evaluations: number } };
        doc.payload.evaluations += 1;
        store.put({ ...records[0], text: JSON.stringify(doc) });
        done = true;
      };
      tx.oncomplete = () => { db.close(); resolve(done); };
      tx.onerror = () => resolve(false);
    };
    open.onerror = () => resolve(false);
  }), `${scope}-`);
}
