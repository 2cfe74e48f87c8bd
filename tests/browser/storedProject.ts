/**
 * What the app keeps in IndexedDB, read from inside the page: for tests that wait until a
 * change has been written (the saver writes a moment after it) before reloading.
 */
import type { Page } from 'playwright-core';

/** Whether the records of every store of the "loci" database, as JSON, hold every one of `needles`. */
export function storedTextHas(page: Page, ...needles: string[]): Promise<boolean> {
  return page.evaluate((wanted) => new Promise<boolean>((resolve) => {
    const open = indexedDB.open('loci');
    open.onsuccess = () => {
      const db = open.result;
      const names = Array.from(db.objectStoreNames);
      const tx = db.transaction(names, 'readonly');
      let text = '';
      for (const n of names) {
        const all = tx.objectStore(n).getAll();
        all.onsuccess = () => { text += JSON.stringify(all.result); };
      }
      tx.oncomplete = () => { db.close(); resolve(wanted.every((w) => text.includes(w))); };
    };
    open.onerror = () => resolve(false);
  }), needles);
}
