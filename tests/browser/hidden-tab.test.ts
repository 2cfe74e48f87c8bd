/**
 * A long search in a hidden tab searches as fast as in a visible one, and the screen wake
 * lock the user asks for is held while the tab is shown and asked for again when it is
 * shown once more.
 *
 * The page is hidden as a user hides it: another tab of the same window is brought to
 * the front (`Target.createTarget`, `Target.activateTarget`), and the test checks
 * `document.visibilityState`. playwright-core cannot be used here: it turns on focus
 * emulation for every page it drives, and Chromium then keeps that page visible (a
 * captured page) whatever tab is in front. So this file starts Chromium itself, with the
 * harness's flags, and speaks the DevTools protocol over the pipe.
 *
 * It searches at that speed because the run's orchestration is not on the page's thread:
 * the page has started one engine worker, and the run's search workers are that worker's
 * children, not the page's (read from the DevTools protocol's target tree).
 *
 * The measure is a ratio within one run, visible and hidden in turns (visible, hidden,
 * hidden, visible, then the other way round, all twice: a steady change of speed over
 * the run, or of the machine's load, weighs on both alike), each block read from the
 * run's own progress reports on the engine's clock. Short blocks, many of them: the
 * search's speed wanders (restarts, checkpoints), and more turns follow it closer.
 * Nothing is timed against a fixed speed.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Readable, Writable } from 'node:stream';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { browserSetup, CHROMIUM_FLAGS, chromiumExecutablePath, describeBrowser } from './harness';

const LONG_BUDGET = '5000000';
const CHECKPOINT_EVERY_S = '2';
/** One block of the measure, ms: each holds one or two of the search's checkpoints; the page takes a report every 250 ms. */
const BLOCK_MS = 3_500;
/** Which blocks are hidden: each half of the measure, the other's mirror image. */
const HIDDEN_BLOCKS = [false, true, true, false, true, false, false, true, false, true, true, false, true, false, false, true];
/** Hidden evaluations per second are at most this share below visible ones (the figure). */
const RATE_TOLERANCE = 0.1;
const POLL_MS = 200;
const WAIT_MS = 120_000;

/** An event of the protocol, with the session it came from. */
interface ProtocolEvent {
  readonly method: string;
  readonly params: Record<string, unknown>;
  readonly sessionId?: string;
}

/** A DevTools protocol client over Chromium's pipe (`--remote-debugging-pipe`: NUL-separated JSON on fds 3 and 4). */
class PipeClient {
  private nextId = 1;
  private buffer = '';
  private readonly waiting = new Map<number, { resolve: (result: unknown) => void; reject: (error: Error) => void }>();
  private readonly out: Writable;
  readonly events: ProtocolEvent[] = [];

  constructor(out: Writable, input: Readable) {
    this.out = out;
    input.on('data', (chunk: Buffer) => {
      this.buffer += chunk.toString('utf8');
      for (let at = this.buffer.indexOf('\0'); at >= 0; at = this.buffer.indexOf('\0')) {
        const message = JSON.parse(this.buffer.slice(0, at)) as { id?: number; result?: unknown; error?: { message: string }; method?: string; params?: Record<string, unknown>; sessionId?: string };
        this.buffer = this.buffer.slice(at + 1);
        if (message.id === undefined && message.method !== undefined) this.events.push({ method: message.method, params: message.params ?? {}, sessionId: message.sessionId });
        const waiter = message.id === undefined ? undefined : this.waiting.get(message.id);
        if (waiter === undefined) continue;
        this.waiting.delete(message.id as number);
        if (message.error !== undefined) waiter.reject(new Error(message.error.message));
        else waiter.resolve(message.result);
      }
    });
  }

  send<T>(method: string, params: object = {}, sessionId?: string): Promise<T> {
    const id = this.nextId++;
    return new Promise<T>((resolve, reject) => {
      this.waiting.set(id, { resolve: resolve as (result: unknown) => void, reject });
      this.out.write(`${JSON.stringify({ id, method, params, ...(sessionId === undefined ? {} : { sessionId }) })}\0`);
    });
  }
}

/** One tab, driven through its session. */
class Tab {
  constructor(
    private readonly client: PipeClient,
    readonly targetId: string,
    private readonly sessionId: string,
  ) {}

  get session(): string {
    return this.sessionId;
  }

  async evaluate<T>(expression: string): Promise<T> {
    const answer = await this.client.send<{ result: { value: T }; exceptionDetails?: { text: string } }>(
      'Runtime.evaluate',
      { expression, awaitPromise: true, returnByValue: true, userGesture: true },
      this.sessionId,
    );
    if (answer.exceptionDetails !== undefined) throw new Error(`${expression}: ${answer.exceptionDetails.text}`);
    return answer.result.value;
  }

  send<T>(method: string, params: object = {}): Promise<T> {
    return this.client.send<T>(method, params, this.sessionId);
  }

  /** Waits until `expression` is true in the page. */
  async until(expression: string, timeoutMs = WAIT_MS): Promise<void> {
    await expect.poll(() => this.evaluate<boolean>(`Boolean(${expression})`), { timeout: timeoutMs, interval: POLL_MS }).toBe(true);
  }
}

/** A worker the protocol attached to: its session, its script and the session of the target that started it. */
interface AttachedWorker {
  readonly sessionId: string;
  readonly url: string;
  readonly parentSessionId: string;
}

function attachedWorkers(client: PipeClient): AttachedWorker[] {
  return client.events.flatMap((event) => {
    if (event.method !== 'Target.attachedToTarget' || event.sessionId === undefined) return [];
    const info = event.params.targetInfo as { type: string; url: string };
    return info.type === 'worker' ? [{ sessionId: event.params.sessionId as string, url: info.url, parentSessionId: event.sessionId }] : [];
  });
}

const byTestId = (id: string) => `document.querySelector('[data-testid="${id}"]')`;
/** The newest progress report the page shows: the run's evaluations and the engine's elapsed time at that report, ms. */
const REPORT = `(() => { const d = ${byTestId('run-evaluations')}?.dataset; return { evaluations: Number(d?.evaluations), elapsedMs: Number(d?.elapsedMs) }; })()`;

interface Report {
  readonly evaluations: number;
  readonly elapsedMs: number;
}

describeBrowser('a search in a hidden tab', () => {
  let chromium: ChildProcess | null = null;
  let profile = '';
  let client: PipeClient;

  beforeAll(async () => {
    profile = await mkdtemp(join(tmpdir(), 'loci-chromium-'));
    const child = spawn(chromiumExecutablePath(), [...CHROMIUM_FLAGS, `--user-data-dir=${profile}`, '--remote-debugging-pipe', 'about:blank'], {
      stdio: ['ignore', 'ignore', 'ignore', 'pipe', 'pipe'],
    });
    chromium = child;
    client = new PipeClient(child.stdio[3] as Writable, child.stdio[4] as Readable);
    // Ready once it answers.
    await client.send('Browser.getVersion');
  });

  afterAll(async () => {
    if (chromium !== null) {
      const exited = new Promise((resolve) => chromium?.once('exit', resolve));
      await client.send('Browser.close').catch(() => {});
      await exited;
    }
    if (profile !== '') await rm(profile, { recursive: true, force: true, maxRetries: 3 });
  });

  async function openTab(url: string): Promise<Tab> {
    const { targetId } = await client.send<{ targetId: string }>('Target.createTarget', { url });
    const { sessionId } = await client.send<{ sessionId: string }>('Target.attachToTarget', { targetId, flatten: true });
    return new Tab(client, targetId, sessionId);
  }

  async function front(tab: Tab): Promise<void> {
    await client.send('Target.activateTarget', { targetId: tab.targetId });
  }

  it('searches as fast hidden as visible, and keeps the screen on only while shown', async () => {
    const setup = browserSetup();
    if (setup.status !== 'ready') throw new Error(setup.reason);
    const app = await openTab(setup.baseUrl);
    await app.until(byTestId('project-name'));
    expect(await app.evaluate<string>('document.visibilityState')).toBe('visible');

    // A long evaluation budget and checkpoints every 2 s (each block of the measure then
    // holds about as many as the next), typed as a user types them, then Start.
    const type = async (label: string, text: string) => {
      await app.evaluate(`(() => { const f = document.querySelector('input[aria-label="${label}"]') ?? [...document.querySelectorAll('label')].find((l) => l.textContent.includes('${label}'))?.querySelector('input'); f.focus(); f.select(); return true; })()`);
      await app.send('Input.insertText', { text });
      for (const key of ['keyDown', 'keyUp']) await app.send('Input.dispatchKeyEvent', { type: key, key: 'Enter', code: 'Enter', windowsVirtualKeyCode: 13 });
      await app.until(`document.querySelector('input[aria-label="${label}"]')?.value === '${text}'`);
    };
    await type('Budget in evaluations', LONG_BUDGET);
    await type('Checkpoint every', CHECKPOINT_EVERY_S);
    await app.evaluate(`[...document.querySelectorAll('button')].find((b) => b.textContent.trim() === 'Start search').click()`);
    await app.until(`${byTestId('run-progress')}?.dataset.status === 'running'`);
    // Warmed up: the workers run and the first checkpoint with evaluations is saved.
    await app.until(`Number(${byTestId('run-checkpoint')}?.dataset.evaluations ?? 0) > 0`);

    // The wake lock, asked for by the user: held while the tab is shown.
    await client.send('Browser.setPermission', { permission: { name: 'screen-wake-lock' }, setting: 'granted', origin: new URL(setup.baseUrl).origin });
    await app.evaluate(`[...document.querySelectorAll('label')].find((l) => l.textContent.includes('Keep the screen on')).querySelector('input').click()`);
    const wakeState = () => app.evaluate<string>(`${byTestId('wake-lock-state')}.dataset.state`);
    await expect.poll(wakeState, { timeout: 10_000 }).toBe('on');

    // Another tab of the same window in front hides this one.
    const other = await openTab('about:blank');
    await front(other);
    await app.until(`document.visibilityState === 'hidden'`, 10_000);
    // Hidden, the browser lets the lock go; the page says it waits to take it again.
    await expect.poll(wakeState, { timeout: 10_000 }).toBe('waiting');
    await front(app);
    await app.until(`document.visibilityState === 'visible'`, 10_000);
    await expect.poll(wakeState, { timeout: 10_000 }).toBe('on');

    // The measure: visible, hidden, hidden, visible, then the same the other way round, twice.
    const rates = { visible: [] as number[], hidden: [] as number[] };
    for (const hidden of HIDDEN_BLOCKS) {
      await front(hidden ? other : app);
      await app.until(`document.visibilityState === '${hidden ? 'hidden' : 'visible'}'`, 10_000);
      // From the first report made after the switch to the last of the block, on the
      // engine's clock: reports come every slice, so reading the page's count at the
      // block's edges would add up to a slice's evaluations to one block and take them
      // from the next.
      const switched = await app.evaluate<Report>(REPORT);
      await expect.poll(async () => (await app.evaluate<Report>(REPORT)).elapsedMs > switched.elapsedMs, { timeout: BLOCK_MS, interval: POLL_MS / 4 }).toBe(true);
      const start = await app.evaluate<Report>(REPORT);
      const startMs = performance.now();
      await expect.poll(() => performance.now() - startMs >= BLOCK_MS, { timeout: BLOCK_MS * 2, interval: POLL_MS }).toBe(true);
      const end = await app.evaluate<Report>(REPORT);
      expect(await app.evaluate<string>('document.visibilityState')).toBe(hidden ? 'hidden' : 'visible');
      expect(await app.evaluate<string>(`${byTestId('run-progress')}.dataset.status`)).toBe('running');
      expect(end.elapsedMs).toBeGreaterThan(start.elapsedMs);
      (hidden ? rates.hidden : rates.visible).push(((end.evaluations - start.evaluations) * 1000) / (end.elapsedMs - start.elapsedMs));
    }
    const mean = (xs: readonly number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
    const ratio = mean(rates.hidden) / mean(rates.visible);
    // The figures behind the ratio, for the record (speed itself is not asserted).
    console.log(`hidden-tab: evaluations/s visible ${rates.visible.map(Math.round).join(', ')}; hidden ${rates.hidden.map(Math.round).join(', ')}; hidden/visible ${ratio.toFixed(3)}`);
    // Source: the acceptance figure (within 10 % of a visible page's over the same
    // interval), read as what it guards against: a hidden tab searching slower. Faster is
    // no fault: on two cores the visible page's drawing takes time the search workers
    // would otherwise have (a clean-clone run read 1.13, a loaded one 1.25).
    expect(ratio).toBeGreaterThanOrEqual(1 - RATE_TOLERANCE);

    // Where the run is: the target tree of workers, each attached as it is (auto-attach
    // attaches to the workers already there; nothing waits for a debugger).
    const AUTO_ATTACH = { autoAttach: true, waitForDebuggerOnStart: false, flatten: true };
    await app.send('Target.setAutoAttach', AUTO_ATTACH);
    await expect.poll(() => attachedWorkers(client).some((w) => w.parentSessionId === app.session && /engineWorker/.test(w.url)), { timeout: 10_000 }).toBe(true);
    const ofPage = attachedWorkers(client).filter((w) => w.parentSessionId === app.session);
    const engineWorkers = ofPage.filter((w) => /engineWorker/.test(w.url));
    expect(engineWorkers).toHaveLength(1);
    await client.send('Target.setAutoAttach', AUTO_ATTACH, engineWorkers[0].sessionId);
    // The run's search workers are the engine worker's children…
    await expect.poll(() => attachedWorkers(client).filter((w) => w.parentSessionId === engineWorkers[0].sessionId && /searchWorker/.test(w.url)).length, { timeout: 10_000 }).toBeGreaterThanOrEqual(1);
    // …and the page started no more than the one that describes its checkpoints.
    expect(ofPage.filter((w) => /searchWorker/.test(w.url)).length).toBeLessThanOrEqual(1);

    await front(app);
    await app.evaluate(`[...document.querySelectorAll('button')].find((b) => b.textContent.trim() === 'Stop').click()`);
    await app.until(`${byTestId('run-progress')}?.dataset.status === 'finished'`);
    expect(await app.evaluate<number>(`document.querySelectorAll('[data-testid="candidate-row"]').length`)).toBeGreaterThanOrEqual(1);
  }, 600_000);
});
