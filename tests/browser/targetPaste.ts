/**
 * The target panel's CSV box, and pastes into it of text made in the page: what the
 * browser tests of target input and the main-thread bench (bench/mainThread.ts) both do.
 */
import type { Locator, Page } from 'playwright-core';

export function csvBox(page: Page): Locator {
  return page.getByLabel(/Rows of x, y in mm/);
}

export async function openCsv(page: Page): Promise<void> {
  const details = page.locator('details.csv-entry');
  if ((await details.getAttribute('open')) === null) await details.locator('summary').click();
}

/**
 * Builds text in the page (rows of distinct points, or one row repeated) up to `chars`
 * characters and keeps it there, so the paste that follows carries no cost of the caller's own.
 */
export async function makeTextInPage(page: Page, chars: number, kind: 'distinct' | 'repeated'): Promise<number> {
  return page.evaluate(
    ({ chars: n, kind: k }) => {
      const parts: string[] = [];
      let length = 0;
      for (let i = 0; length < n; i++) {
        const row = k === 'repeated' ? '123.456,-78.9\n' : `${i},${(i * 7) % 1000}\n`;
        parts.push(row);
        length += row.length;
      }
      const text = parts.join('').slice(0, n);
      (window as unknown as { __text: string }).__text = text;
      return text.length;
    },
    { chars, kind },
  );
}

/** Pastes the text kept in the page into `box` as a paste event with a DataTransfer; false when the page cancelled it. */
export function pasteKeptText(box: Locator): Promise<boolean> {
  return box.evaluate((el) => {
    const data = new DataTransfer();
    data.setData('text/plain', (window as unknown as { __text: string }).__text);
    return el.dispatchEvent(new ClipboardEvent('paste', { clipboardData: data, bubbles: true, cancelable: true }));
  });
}
