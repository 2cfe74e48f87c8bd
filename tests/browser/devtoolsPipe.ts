/**
 * Chromium driven over the DevTools protocol directly, for what playwright-core cannot
 * do: hide a page as a user hides it. playwright-core turns on focus emulation for every
 * page it drives, and Chromium then keeps that page visible (a captured page) whatever
 * tab is in front. Here Chromium is started with the harness's flags and spoken to over
 * its pipe (`--remote-debugging-pipe`: NUL-separated JSON on fds 3 and 4); another tab
 * brought to the front (`Target.activateTarget`) hides the app's tab.
 *
 * Used by the hidden-tab browser test and by the hidden-tab bench, which measures the
 * hidden page's speed against the visible one's.
 */
import { spawn } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Readable, Writable } from 'node:stream';
import { CHROMIUM_FLAGS, chromiumExecutablePath } from './chromium';

const POLL_MS = 200;
const WAIT_MS = 120_000;

/** An event of the protocol, with the session it came from. */
interface ProtocolEvent {
  readonly method: string;
  readonly params: Record<string, unknown>;
  readonly sessionId?: string;
}

/** A DevTools protocol client over Chromium's pipe. */
export class PipeClient {
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

/** Polls `read` until `done` holds of its value; throws `what` after `timeoutMs`. */
export async function pollUntil<T>(read: () => Promise<T>, done: (value: T) => boolean, what: string, timeoutMs = WAIT_MS, intervalMs = POLL_MS): Promise<T> {
  const deadline = performance.now() + timeoutMs;
  for (;;) {
    const value = await read();
    if (done(value)) return value;
    if (performance.now() > deadline) throw new Error(`not within ${timeoutMs} ms: ${what} (last read ${JSON.stringify(value)})`);
    await new Promise((resolve) => setTimeout(resolve, intervalMs));
  }
}

/** One tab, driven through its session. */
export class Tab {
  constructor(
    private readonly client: PipeClient,
    readonly targetId: string,
    readonly session: string,
  ) {}

  async evaluate<T>(expression: string): Promise<T> {
    const answer = await this.client.send<{ result: { value: T }; exceptionDetails?: { text: string } }>(
      'Runtime.evaluate',
      { expression, awaitPromise: true, returnByValue: true, userGesture: true },
      this.session,
    );
    if (answer.exceptionDetails !== undefined) throw new Error(`${expression}: ${answer.exceptionDetails.text}`);
    return answer.result.value;
  }

  send<T>(method: string, params: object = {}): Promise<T> {
    return this.client.send<T>(method, params, this.session);
  }

  /** Waits until `expression` is true in the page. */
  async until(expression: string, timeoutMs = WAIT_MS): Promise<void> {
    await pollUntil(() => this.evaluate<boolean>(`Boolean(${expression})`), (value) => value, expression, timeoutMs);
  }
}

/** A worker the protocol attached to: its session, its script and the session of the target that started it. */
export interface AttachedWorker {
  readonly sessionId: string;
  readonly url: string;
  readonly parentSessionId: string;
}

export function attachedWorkers(client: PipeClient): AttachedWorker[] {
  return client.events.flatMap((event) => {
    if (event.method !== 'Target.attachedToTarget' || event.sessionId === undefined) return [];
    const info = event.params.targetInfo as { type: string; url: string };
    return info.type === 'worker' ? [{ sessionId: event.params.sessionId as string, url: info.url, parentSessionId: event.sessionId }] : [];
  });
}

/** Chromium on a pipe, with a fresh profile. */
export interface PipedChromium {
  readonly client: PipeClient;
  /** A new tab of the same window at `url`, attached. */
  openTab(url: string): Promise<Tab>;
  /** Brings `tab` to the front, which hides the tab that was there. */
  front(tab: Tab): Promise<void>;
  /** Closes the browser and removes its profile folder. */
  close(): Promise<void>;
}

export async function launchPipedChromium(): Promise<PipedChromium> {
  const profile = await mkdtemp(join(tmpdir(), 'loci-chromium-'));
  const child = spawn(chromiumExecutablePath(), [...CHROMIUM_FLAGS, `--user-data-dir=${profile}`, '--remote-debugging-pipe', 'about:blank'], {
    stdio: ['ignore', 'ignore', 'ignore', 'pipe', 'pipe'],
  });
  const exited = new Promise((resolve) => child.once('exit', resolve));
  const client = new PipeClient(child.stdio[3] as Writable, child.stdio[4] as Readable);
  try {
    // Ready once it answers.
    await client.send('Browser.getVersion');
  } catch (error) {
    child.kill();
    await rm(profile, { recursive: true, force: true, maxRetries: 3 });
    throw error;
  }
  return {
    client,
    async openTab(url) {
      const { targetId } = await client.send<{ targetId: string }>('Target.createTarget', { url });
      const { sessionId } = await client.send<{ sessionId: string }>('Target.attachToTarget', { targetId, flatten: true });
      return new Tab(client, targetId, sessionId);
    },
    async front(tab) {
      await client.send('Target.activateTarget', { targetId: tab.targetId });
    },
    async close() {
      await client.send('Browser.close').catch(() => {});
      await exited;
      await rm(profile, { recursive: true, force: true, maxRetries: 3 });
    },
  };
}

export const byTestId = (id: string) => `document.querySelector('[data-testid="${id}"]')`;

/** The newest progress report the page shows: the run's evaluations and the engine's elapsed time at that report, ms. */
export interface Report {
  readonly evaluations: number;
  readonly elapsedMs: number;
}

export function readReport(app: Tab): Promise<Report> {
  return app.evaluate<Report>(`(() => { const d = ${byTestId('run-evaluations')}?.dataset; return { evaluations: Number(d?.evaluations), elapsedMs: Number(d?.elapsedMs) }; })()`);
}

/** Types `text` into the field labelled `label` as a user does (select, type, Enter) and waits until it holds it. */
async function typeInto(app: Tab, label: string, text: string): Promise<void> {
  await app.evaluate(`(() => { const f = document.querySelector('input[aria-label="${label}"]') ?? [...document.querySelectorAll('label')].find((l) => l.textContent.includes('${label}'))?.querySelector('input'); f.focus(); f.select(); return true; })()`);
  await app.send('Input.insertText', { text });
  for (const key of ['keyDown', 'keyUp']) await app.send('Input.dispatchKeyEvent', { type: key, key: 'Enter', code: 'Enter', windowsVirtualKeyCode: 13 });
  await app.until(`document.querySelector('input[aria-label="${label}"]')?.value === '${text}'`);
}

/**
 * On the app's opening page (the demo path target): a search with `budget` evaluations
 * and a checkpoint every `checkpointEveryS` seconds, typed in, started, and warmed up (its
 * workers run and its first checkpoint with evaluations is saved).
 */
export async function startSearch(app: Tab, budget: string, checkpointEveryS: string): Promise<void> {
  await app.until(byTestId('project-name'));
  await typeInto(app, 'Budget in evaluations', budget);
  await typeInto(app, 'Checkpoint every', checkpointEveryS);
  await app.evaluate(`[...document.querySelectorAll('button')].find((b) => b.textContent.trim() === 'Start search').click()`);
  await app.until(`${byTestId('run-progress')}?.dataset.status === 'running'`);
  await app.until(`Number(${byTestId('run-checkpoint')}?.dataset.evaluations ?? 0) > 0`);
}

/** Shows `hidden ? other : app` and waits until the app's page says it is hidden or visible. */
export async function showApp(chromium: PipedChromium, app: Tab, other: Tab, hidden: boolean): Promise<void> {
  await chromium.front(hidden ? other : app);
  await app.until(`document.visibilityState === '${hidden ? 'hidden' : 'visible'}'`, 10_000);
}

/**
 * The run's progress over about `blockMs` from now, on the engine's clock: from the first
 * report made after this call to the last one made within the block. Reports come every
 * slice, so reading the page's count at the block's edges would add up to a slice's
 * evaluations to one block and take them from the next.
 */
export async function progressOver(app: Tab, blockMs: number): Promise<{ readonly start: Report; readonly end: Report }> {
  const switched = await readReport(app);
  const start = await pollUntil(() => readReport(app), (report) => report.elapsedMs > switched.elapsedMs, 'a progress report', blockMs, POLL_MS / 4);
  await new Promise((resolve) => setTimeout(resolve, blockMs));
  const end = await readReport(app);
  return { start, end };
}
