/**
 * A screen wake lock the user asks for, so a long search is not stopped by the screen
 * going to sleep (and the machine with it). The browser releases the lock whenever the
 * page is hidden; it is asked for again each time the page is visible once more, for as
 * long as the user wants it.
 */

export type WakeLockState =
  | { readonly kind: 'off' }
  /** Held: the screen stays on while the page is visible. */
  | { readonly kind: 'on' }
  /** Wanted, but the page is hidden (the browser released it); asked for again when visible. */
  | { readonly kind: 'waiting' }
  | { readonly kind: 'refused'; readonly reason: string }
  | { readonly kind: 'unsupported' };

/** The parts of the Screen Wake Lock API used here. */
interface SentinelLike {
  readonly released: boolean;
  release(): Promise<void>;
  addEventListener(type: 'release', listener: () => void): void;
}
export interface WakeLockHost {
  readonly wakeLock?: { request(type: 'screen'): Promise<SentinelLike> };
  readonly visible: () => boolean;
  readonly onVisibilityChange: (listener: () => void) => () => void;
}

export function browserWakeLockHost(): WakeLockHost {
  return {
    wakeLock: (navigator as { wakeLock?: WakeLockHost['wakeLock'] }).wakeLock,
    visible: () => document.visibilityState === 'visible',
    onVisibilityChange(listener) {
      document.addEventListener('visibilitychange', listener);
      return () => document.removeEventListener('visibilitychange', listener);
    },
  };
}

export class ScreenWakeLock {
  private readonly host: WakeLockHost;
  private readonly onState: (state: WakeLockState) => void;
  private sentinel: SentinelLike | null = null;
  private wanted = false;
  private stopWatching: (() => void) | null = null;

  constructor(host: WakeLockHost, onState: (state: WakeLockState) => void) {
    this.host = host;
    this.onState = onState;
  }

  /** Asks for the lock (true) or lets it go (false). */
  async want(wanted: boolean): Promise<void> {
    this.wanted = wanted;
    if (!wanted) {
      this.stopWatching?.();
      this.stopWatching = null;
      const sentinel = this.sentinel;
      this.sentinel = null;
      await sentinel?.release().catch(() => {});
      this.onState({ kind: 'off' });
      return;
    }
    if (this.host.wakeLock === undefined) {
      this.wanted = false;
      this.onState({ kind: 'unsupported' });
      return;
    }
    this.stopWatching ??= this.host.onVisibilityChange(() => void this.acquire());
    await this.acquire();
  }

  private async acquire(): Promise<void> {
    const api = this.host.wakeLock;
    if (!this.wanted || api === undefined || (this.sentinel !== null && !this.sentinel.released)) return;
    if (!this.host.visible()) {
      this.onState({ kind: 'waiting' });
      return;
    }
    try {
      const sentinel = await api.request('screen');
      if (!this.wanted) {
        await sentinel.release().catch(() => {});
        return;
      }
      this.sentinel = sentinel;
      sentinel.addEventListener('release', () => {
        if (this.sentinel === sentinel && this.wanted) this.onState({ kind: 'waiting' });
      });
      this.onState({ kind: 'on' });
    } catch (error) {
      this.onState({ kind: 'refused', reason: error instanceof Error ? `${error.name}: ${error.message}` : String(error) });
    }
  }

  dispose(): void {
    void this.want(false);
  }
}
