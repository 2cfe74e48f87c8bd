/**
 * A long search in a hidden tab goes on, run by workers the page does not orchestrate,
 * and the screen wake lock the user asks for is held while the tab is shown and asked for
 * again when it is shown once more.
 *
 * The page is hidden as a user hides it: another tab of the same window is brought to
 * the front, and the test checks `document.visibilityState` (devtoolsPipe.ts says why
 * this file drives Chromium over the DevTools protocol rather than through
 * playwright-core).
 *
 * Why a hidden tab searches at a visible one's speed: the browser slows a hidden page's
 * timers, and the run's orchestration is not on the page's thread. The page has started
 * one engine worker, and the run's search workers are that worker's children, not the
 * page's (read here from the protocol's target tree). How fast it searches hidden against
 * visible is a rate, which the machine's load moves: `npm run bench -- hidden-tab`
 * measures it (bench/hiddenTab.ts); this test asserts no speed.
 */
import { afterAll, beforeAll, expect, it } from 'vitest';
import { attachedWorkers, byTestId, launchPipedChromium, pollUntil, readReport, showApp, startSearch, type PipedChromium } from './devtoolsPipe';
import { browserSetup, describeBrowser } from './harness';

const LONG_BUDGET = '5000000';
const CHECKPOINT_EVERY_S = '2';
const WAIT_MS = 60_000;

describeBrowser('a search in a hidden tab', () => {
  let chromium: PipedChromium | null = null;

  beforeAll(async () => {
    chromium = await launchPipedChromium();
  });

  afterAll(async () => {
    await chromium?.close();
  });

  it('searches on while hidden, in workers the page does not orchestrate, and keeps the screen on only while shown', async () => {
    const setup = browserSetup();
    if (setup.status !== 'ready' || chromium === null) throw new Error(setup.status === 'skipped' ? setup.reason : 'Chromium did not start');
    const browser = chromium;
    const app = await browser.openTab(setup.baseUrl);
    await startSearch(app, LONG_BUDGET, CHECKPOINT_EVERY_S);
    expect(await app.evaluate<string>('document.visibilityState')).toBe('visible');

    // The wake lock, asked for by the user: held while the tab is shown.
    await browser.client.send('Browser.setPermission', { permission: { name: 'screen-wake-lock' }, setting: 'granted', origin: new URL(setup.baseUrl).origin });
    await app.evaluate(`[...document.querySelectorAll('label')].find((l) => l.textContent.includes('Keep the screen on')).querySelector('input').click()`);
    const wakeState = () => app.evaluate<string>(`${byTestId('wake-lock-state')}.dataset.state`);
    await expect.poll(wakeState, { timeout: 10_000 }).toBe('on');

    // Another tab of the same window in front hides this one; the browser lets the lock
    // go, and the page says it waits to take it again.
    const other = await browser.openTab('about:blank');
    await showApp(browser, app, other, true);
    await expect.poll(wakeState, { timeout: 10_000 }).toBe('waiting');

    // Hidden, the search goes on: new progress reports with more evaluations, and
    // checkpoints saved one after another (each with more evaluations than the last).
    const checkpointEvaluations = () => app.evaluate<number>(`Number(${byTestId('run-checkpoint')}.dataset.evaluations)`);
    const hiddenAt = await readReport(app);
    let checkpointed = await checkpointEvaluations();
    for (let checkpoint = 0; checkpoint < 3; checkpoint++) {
      const before = checkpointed;
      checkpointed = await pollUntil(checkpointEvaluations, (evaluations) => evaluations > before, 'a newer checkpoint while hidden', WAIT_MS);
    }
    const hiddenLast = await readReport(app);
    expect(hiddenLast.elapsedMs).toBeGreaterThan(hiddenAt.elapsedMs);
    expect(hiddenLast.evaluations).toBeGreaterThan(hiddenAt.evaluations);
    expect(await app.evaluate<string>('document.visibilityState')).toBe('hidden');
    expect(await app.evaluate<string>(`${byTestId('run-progress')}.dataset.status`)).toBe('running');

    await showApp(browser, app, other, false);
    await expect.poll(wakeState, { timeout: 10_000 }).toBe('on');

    // Where the run is: the target tree of workers, each attached as it is (auto-attach
    // attaches to the workers already there; nothing waits for a debugger).
    const AUTO_ATTACH = { autoAttach: true, waitForDebuggerOnStart: false, flatten: true };
    await app.send('Target.setAutoAttach', AUTO_ATTACH);
    await expect.poll(() => attachedWorkers(browser.client).some((w) => w.parentSessionId === app.session && /engineWorker/.test(w.url)), { timeout: 10_000 }).toBe(true);
    const ofPage = attachedWorkers(browser.client).filter((w) => w.parentSessionId === app.session);
    const engineWorkers = ofPage.filter((w) => /engineWorker/.test(w.url));
    expect(engineWorkers).toHaveLength(1);
    await browser.client.send('Target.setAutoAttach', AUTO_ATTACH, engineWorkers[0].sessionId);
    // The run's search workers are the engine worker's children…
    await expect.poll(() => attachedWorkers(browser.client).filter((w) => w.parentSessionId === engineWorkers[0].sessionId && /searchWorker/.test(w.url)).length, { timeout: 10_000 }).toBeGreaterThanOrEqual(1);
    // …and the page started no more than the one that describes its checkpoints.
    expect(ofPage.filter((w) => /searchWorker/.test(w.url)).length).toBeLessThanOrEqual(1);

    await app.evaluate(`[...document.querySelectorAll('button')].find((b) => b.textContent.trim() === 'Stop').click()`);
    await app.until(`${byTestId('run-progress')}?.dataset.status === 'finished'`);
    expect(await app.evaluate<number>(`document.querySelectorAll('[data-testid="candidate-row"]').length`)).toBeGreaterThanOrEqual(1);
  }, 300_000);
});
