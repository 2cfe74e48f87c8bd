/**
 * The storage status a long search shows (usage of quota, whether the browser keeps the
 * storage, checkpoint writes failing and saved again) and the screen wake lock the user
 * asks for, against stand-ins for the browser's StorageManager and Screen Wake Lock API
 * that behave as the specifications say (a lock is released when the page is hidden).
 */
import { describe, expect, it } from 'vitest';
import { createStorageStatus, formatMegabytes, saveFailureReason } from '../../../src/app/storage/storageStatus';
import { ScreenWakeLock, type WakeLockHost, type WakeLockState } from '../../../src/app/search/screenWakeLock';

describe('storage status', () => {
  it('reads usage and quota, asks to persist and says the answer', async () => {
    let asked = 0;
    const status = createStorageStatus(
      {
        estimate: () => Promise.resolve({ usage: 2_500_000, quota: 300_000_000 }),
        persisted: () => Promise.resolve(false),
        persist: () => {
          asked++;
          return Promise.resolve(true);
        },
      },
      () => 0,
    );
    await status.refresh(true);
    expect(status.getSnapshot()).toMatchObject({ usageBytes: 2_500_000, quotaBytes: 300_000_000, persistence: 'best-effort' });
    expect(await status.askPersistence()).toBe('persistent');
    expect(asked).toBe(1);
    expect(status.getSnapshot().persistence).toBe('persistent');
  });

  it('says a browser without the API cannot be asked, and a refusal as declined', async () => {
    expect(await createStorageStatus(undefined, () => 0).askPersistence()).toBe('unsupported');
    expect(await createStorageStatus({ persist: () => Promise.resolve(false) }, () => 0).askPersistence()).toBe('declined');
  });

  it('holds a failed write until one succeeds, then says writes are saved again', () => {
    const status = createStorageStatus(undefined, () => 0);
    let told = 0;
    status.subscribe(() => told++);
    status.failed(saveFailureReason(new DOMException('The quota has been exceeded.', 'QuotaExceededError')));
    expect(status.getSnapshot().saveFailure).toBe('QuotaExceededError: The quota has been exceeded');
    status.saved();
    expect(status.getSnapshot()).toMatchObject({ saveFailure: null, savedAgain: true });
    expect(told).toBe(2);
  });

  it('shows megabytes of 10⁶ bytes', () => {
    // Source: BIPM, "The International System of Units (SI)", 9th edition, 2019, table 7 (mega = 10⁶)
    expect(formatMegabytes(1_234_567)).toBe('1.2 MB');
    expect(formatMegabytes(2_345_000_000)).toBe('2,345 MB');
  });
});

/** A page and its Screen Wake Lock API: a lock is released when the page is hidden (W3C Screen Wake Lock API, 2024, §"Handling document loss of visibility"). */
function fakePage(refuse = false) {
  let visible = true;
  const onChange = new Set<() => void>();
  const sentinels: { released: boolean; onRelease: (() => void)[] }[] = [];
  const host: WakeLockHost = {
    wakeLock: {
      request: () => {
        if (refuse) return Promise.reject(new DOMException('Wake Lock permission request denied', 'NotAllowedError'));
        if (!visible) return Promise.reject(new DOMException('The requesting page is not visible', 'NotAllowedError'));
        const s = { released: false, onRelease: [] as (() => void)[] };
        sentinels.push(s);
        return Promise.resolve({
          get released() {
            return s.released;
          },
          release: () => {
            s.released = true;
            return Promise.resolve();
          },
          addEventListener: (_: 'release', listener: () => void) => s.onRelease.push(listener),
        });
      },
    },
    visible: () => visible,
    onVisibilityChange(listener) {
      onChange.add(listener);
      return () => onChange.delete(listener);
    },
  };
  const setVisible = async (v: boolean) => {
    visible = v;
    if (!v) for (const s of sentinels.filter((x) => !x.released)) {
      s.released = true;
      for (const l of s.onRelease) l();
    }
    for (const l of onChange) l();
    await Promise.resolve();
    await Promise.resolve();
  };
  return { host, setVisible, held: () => sentinels.filter((s) => !s.released).length };
}

describe('screen wake lock', () => {
  it('is held while shown, waits while hidden, is taken again when shown, and let go on the user\'s word', async () => {
    const page = fakePage();
    const states: WakeLockState['kind'][] = [];
    const lock = new ScreenWakeLock(page.host, (s) => states.push(s.kind));
    await lock.want(true);
    expect(states.at(-1)).toBe('on');
    expect(page.held()).toBe(1);
    await page.setVisible(false);
    expect(states.at(-1)).toBe('waiting');
    expect(page.held()).toBe(0);
    await page.setVisible(true);
    expect(states.at(-1)).toBe('on');
    expect(page.held()).toBe(1);
    await lock.want(false);
    expect(states.at(-1)).toBe('off');
    expect(page.held()).toBe(0);
    // Let go, it is not taken again when the page is shown once more.
    await page.setVisible(false);
    await page.setVisible(true);
    expect(page.held()).toBe(0);
  });

  it('says a refusal with its reason, and a browser without the API', async () => {
    const states: WakeLockState[] = [];
    await new ScreenWakeLock(fakePage(true).host, (s) => states.push(s)).want(true);
    expect(states.at(-1)).toEqual({ kind: 'refused', reason: 'NotAllowedError: Wake Lock permission request denied' });
    await new ScreenWakeLock({ ...fakePage().host, wakeLock: undefined }, (s) => states.push(s)).want(true);
    expect(states.at(-1)).toEqual({ kind: 'unsupported' });
  });
});
