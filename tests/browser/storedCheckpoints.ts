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

/**
 * For a page about to be reloaded while its search runs: from now on the page writes no
 * checkpoint (each write throws, as in a page that is going away; in this document only,
 * not an init script, so the reloaded page saves as before), then one digit of the newest
 * checkpoint's evaluation count (runs `scope-…`) is changed under its unchanged checksum,
 * as a torn write leaves it. Without the first step a search that saves every few seconds
 * may write a newer checkpoint between the damage and the reload, and the page would go
 * on from that one. Gives the evaluations of the checkpoint before the damaged one, the
 * one a resume goes back to; null when fewer than two checkpoints are stored.
 */
export function damageNewestCheckpointOfRunningSearch(page: Page, scope: string): Promise<number | null> {
  return page.evaluate((prefix) => new Promise<number | null>((resolve, reject) => {
    const put = IDBObjectStore.prototype.put;
    IDBObjectStore.prototype.put = function (this: IDBObjectStore, ...args: Parameters<IDBObjectStore['put']>) {
      if (this.name === 'checkpoints') throw new DOMException('the test reloads this page: it writes no more checkpoints', 'AbortError');
      return put.apply(this, args);
    };
    const open = indexedDB.open('loci');
    open.onerror = () => reject(new Error('cannot open the database'));
    open.onsuccess = () => {
      const db = open.result;
      // A save begun before the writes stopped is a transaction created before this one: it ends first, and is seen here.
      const tx = db.transaction('checkpoints', 'readwrite');
      const store = tx.objectStore('checkpoints');
      const all = store.getAll();
      let beforeEvaluations: number | null = null;
      all.onsuccess = () => {
        const records = (all.result as { runId: string; seq: number; text: string }[]).filter((r) => r.runId.startsWith(prefix)).sort((a, b) => b.seq - a.seq);
        if (records.length < 2) return;
        const [newest, before] = records;
        const at = newest.text.indexOf('"evaluations":') + '"evaluations":'.length;
        const digit = newest.text[at];
        const text = newest.text.slice(0, at) + (digit === '9' ? '8' : String(Number(digit) + 1)) + newest.text.slice(at + 1);
        put.call(store, { ...newest, text });
        beforeEvaluations = (JSON.parse(before.text) as { payload: { evaluations: number } }).payload.evaluations;
      };
      tx.oncomplete = () => { db.close(); resolve(beforeEvaluations); };
      tx.onerror = () => reject(new Error('the damaging write failed'));
    };
  }), `${scope}-`);
}

/** The checkpoint the path workspace says it last saved (its round and evaluations), or null before the first. */
export async function pathCheckpointShown(page: Page): Promise<{ round: number; evaluations: number } | null> {
  const note = page.getByTestId('run-checkpoint');
  if ((await note.count()) === 0) return null;
  return { round: Number(await note.getAttribute('data-round')), evaluations: Number(await note.getAttribute('data-evaluations')) };
}

/** The evaluations the path workspace's progress shows ("1,234 of 5,000,000" → 1234). */
export async function pathEvaluationsShown(page: Page): Promise<number> {
  const text = (await page.getByTestId('run-evaluations').textContent()) ?? '';
  return Number(text.split(' of ')[0].replace(/,/g, ''));
}

/**
 * An init script (`context.addInitScript({ content })`) that tears the `nth` checkpoint
 * write of the page's session: right after the record is put, its transaction is
 * aborted and the page reloads, as a reload or crash does to a transaction not yet
 * committed. Once per tab (sessionStorage remembers it across the reload), noting the
 * evaluations of the torn checkpoint and of the one written before it under
 * `loci-test-torn-write`. The page it reloads writes no checkpoint after the torn one (each
 * write throws, as in a page going away): it runs on until the new page replaces it, and a
 * checkpoint it saved in that moment, on a slow machine, would be the one resumed from.
 */
export function tornCheckpointWriteScript(nth: number): string {
  return `(() => {
    const KEY = 'loci-test-torn-write';
    if (sessionStorage.getItem(KEY) !== null) return;
    const put = IDBObjectStore.prototype.put;
    const evaluationsOf = (text) => { try { return JSON.parse(text).payload.evaluations; } catch { return null; } };
    let writes = 0;
    let before = null;
    let reloading = false;
    IDBObjectStore.prototype.put = function (...args) {
      if (this.name === 'checkpoints' && reloading) throw new DOMException('the page is reloading: it writes no more checkpoints', 'AbortError');
      const request = put.apply(this, args);
      if (this.name === 'checkpoints') {
        writes += 1;
        const evaluations = evaluationsOf(args[0].text);
        if (writes === ${nth}) {
          sessionStorage.setItem(KEY, JSON.stringify({ torn: evaluations, before }));
          this.transaction.abort();
          reloading = true;
          location.reload();
        }
        before = evaluations;
      }
      return request;
    };
  })();`;
}

/** What `tornCheckpointWriteScript` noted: the evaluations of the torn checkpoint and of the one before it; null until it tore one. */
export async function tornCheckpointWrite(page: Page): Promise<{ torn: number; before: number } | null> {
  const text = await page.evaluate(() => sessionStorage.getItem('loci-test-torn-write'));
  return text === null ? null : (JSON.parse(text) as { torn: number; before: number });
}

/**
 * An init script that lets a test fill the storage: while `setStorageFull(page, true)`
 * holds, every checkpoint write throws QuotaExceededError, the error the browser's
 * IndexedDB gives when the disk or the site's quota is full. (Chromium 156's
 * `Storage.overrideQuotaForOrigin` reports the override active but did not refuse
 * IndexedDB writes in a test context, so the fault is made here, in the page.)
 */
export const STORAGE_FULL_SCRIPT = `(() => {
  const put = IDBObjectStore.prototype.put;
  IDBObjectStore.prototype.put = function (...args) {
    if (this.name === 'checkpoints' && window.__lociTestStorageFull === true) throw new DOMException('The quota has been exceeded.', 'QuotaExceededError');
    return put.apply(this, args);
  };
})();`;

/** Fills (true) or frees (false) the storage of a page that runs STORAGE_FULL_SCRIPT. */
export async function setStorageFull(page: Page, full: boolean): Promise<void> {
  await page.evaluate((value) => {
    (window as unknown as { __lociTestStorageFull: boolean }).__lociTestStorageFull = value;
  }, full);
}
