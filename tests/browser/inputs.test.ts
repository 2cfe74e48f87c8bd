/**
 * Honest inputs and state that tells the truth, as a user meets them in headless
 * Chromium: every bad number is refused beside its field, in words that name the field
 * and say what is expected, with Start disabled and the list of what to fix; nothing
 * typed is rewritten. The project's name is edited and kept across a reload; results of
 * a previous target say so; a new target clears the old target's bounds and keep-out
 * regions and offers them back; "Resumed after a reload" shows only after a reload.
 */
import type { Locator, Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { MAX_BOUND_MAGNITUDE } from '../../src/core/synthesis/problem';
import { defineRun } from '../../src/engine';
import { describeBrowser, saveScreenshot, useBrowser, type AppPage } from './harness';

const SEARCH_TIMEOUT_MS = 150_000;
/** A test with a search in it: a wait for the search may take SEARCH_TIMEOUT_MS, more than the 60 s a test may take by default. */
const SEARCH_TEST_MS = 2 * SEARCH_TIMEOUT_MS;
/** A test that waits for a search several times (a checkpoint, a resume after a reload, the end). */
const LONG_SEARCH_TEST_MS = 4 * SEARCH_TIMEOUT_MS;

/** Words of the code's own: dotted paths and array indices, which the page must never show. */
const INTERNAL_PATH = /\b(?:bounds|budget|jobs|constraints|target|objective|problem)(?:\.|\[)|worker \d+ refused/;

async function openWorkspace(browser: ReturnType<typeof useBrowser>): Promise<AppPage> {
  const app = await browser.openApp('/');
  await app.page.getByTestId('project-name').waitFor({ timeout: 30_000 });
  return app;
}

function startButton(page: Page): Locator {
  return page.getByRole('button', { name: 'Start search' });
}

async function runStatus(page: Page): Promise<string | null> {
  return page.getByTestId('run-progress').getAttribute('data-status');
}

async function waitForStatus(page: Page, statuses: readonly string[], timeoutMs = SEARCH_TIMEOUT_MS): Promise<string> {
  await expect.poll(() => runStatus(page), { timeout: timeoutMs, interval: 250 }).toSatisfy((s: string | null) => s !== null && statuses.includes(s));
  return (await runStatus(page)) as string;
}

/** Types into a field as a user does, and leaves it (Tab), which is when a field commits what it accepts. */
async function type(field: Locator, text: string): Promise<void> {
  await field.fill(text);
  await field.press('Tab');
}

/** The message beside a field: the element its aria-describedby names. */
async function messageBeside(page: Page, field: Locator): Promise<string> {
  const id = await field.getAttribute('aria-describedby');
  if (id === null) return '';
  return (await page.locator(`[id="${id}"]`).textContent()) ?? '';
}

/**
 * The field is refused as the user sees it: marked invalid, the message beside it
 * matches, the text stays as typed, Start is disabled, and the list under Start holds the
 * same message, with no internal path in either.
 */
async function expectRefused(page: Page, field: Locator, typed: string, message: RegExp): Promise<string> {
  expect(await field.getAttribute('aria-invalid')).toBe('true');
  const beside = await messageBeside(page, field);
  expect(beside).toMatch(message);
  expect(beside).not.toMatch(INTERNAL_PATH);
  expect(await field.inputValue()).toBe(typed);
  expect(await startButton(page).isDisabled()).toBe(true);
  const list = (await page.getByTestId('start-issues').textContent()) ?? '';
  expect(list).toContain(beside);
  expect(list).not.toMatch(INTERNAL_PATH);
  return beside;
}

/** A screenshot of an error state, with the field and its message in the middle of the view. */
async function shoot(page: Page, field: Locator, name: string): Promise<void> {
  await field.evaluate((el) => el.scrollIntoView({ block: 'center' }));
  await saveScreenshot(page, name);
}

async function expectAccepted(page: Page, field: Locator): Promise<void> {
  expect(await field.getAttribute('aria-invalid')).toBe('false');
  await expect.poll(() => startButton(page).isDisabled()).toBe(false);
  expect(await page.getByTestId('start-issues').count()).toBe(0);
}

async function pasteCsv(page: Page, text: string): Promise<void> {
  const details = page.locator('details.csv-entry');
  if ((await details.getAttribute('open')) === null) await details.locator('summary').click();
  await page.getByLabel(/Rows of x, y in mm/).fill(text);
  await page.getByRole('button', { name: 'Read pasted points' }).click();
}

async function openBounds(page: Page): Promise<void> {
  const details = page.locator('details.bounds-editor');
  if ((await details.getAttribute('open')) === null) await details.locator('summary').click();
}

/** The project as IndexedDB holds it (what a reload reads back). */
function savedProjectName(page: Page): Promise<string | null> {
  return page.evaluate(
    () =>
      new Promise<string | null>((resolve, reject) => {
        const open = indexedDB.open('loci');
        open.onerror = () => reject(new Error('cannot open the database'));
        open.onsuccess = () => {
          const get = open.result.transaction('projects').objectStore('projects').get('current');
          get.onsuccess = () => resolve((get.result as { name?: string } | undefined)?.name ?? null);
        };
      }),
  );
}

/** A run of one job on a test function, for asking the engine itself what it accepts. */
function engineAccepts(budget: { evaluations?: number }, seed = 1): boolean {
  return defineRun({ jobs: [{ id: 'j', objective: { kind: 'test-function', name: 'sphere', dim: 2 }, seed }], budget }).ok;
}

describeBrowser('honest inputs', () => {
  const browser = useBrowser();

  it('refuses a bad budget, seed or angle beside its field, keeps Start disabled, and rewrites nothing', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    const budget = page.getByLabel('Budget in evaluations');
    const seed = page.getByLabel('Seed', { exact: true });
    const angle = page.getByLabel('Minimum transmission angle (degrees)');
    await expect.poll(() => startButton(page).isDisabled()).toBe(false);

    // An evaluation count is a whole number, at least 1 (common practice); the engine's own check agrees.
    for (const typed of ['0', '-5', '1.5']) {
      expect(engineAccepts({ evaluations: Number(typed) })).toBe(false);
      await type(budget, typed);
      await expectRefused(page, budget, typed, /^Budget in evaluations: .*; expected a whole number of evaluations from [\d,]+ to 1,000,000,000/);
    }
    expect(await messageBeside(page, budget)).toMatch(/1\.5 is not a whole number/);
    await shoot(page, budget, 'inputs-budget-fraction');
    await type(budget, '1e12');
    await expectRefused(page, budget, '1e12', /^Budget in evaluations: 1e12 is more than 1,000,000,000/);
    await type(budget, 'abc');
    await expectRefused(page, budget, 'abc', /^Budget in evaluations: "abc" is not a number/);
    await shoot(page, budget, 'inputs-budget-not-a-number');
    // A comma in a count is a thousands separator, not a decimal comma: refused, never read as 20.
    await type(budget, '20,000');
    await expectRefused(page, budget, '20,000', /^Budget in evaluations: "20,000" has a comma/);
    await type(budget, '3000');
    await expectAccepted(page, budget);

    // Source: ECMA-262, Number.MAX_SAFE_INTEGER = 2^53 − 1, the largest integer a double holds exactly; the engine takes seeds up to it.
    expect(engineAccepts({ evaluations: 100 }, 1e30)).toBe(false);
    expect(engineAccepts({ evaluations: 100 }, 2 ** 53 - 1)).toBe(true);
    await type(seed, '1e30');
    await expectRefused(page, seed, '1e30', /^Seed: 1e30 is more than 9,007,199,254,740,991; expected a whole number from 0 to 9,007,199,254,740,991/);
    await type(seed, String(2 ** 53 - 1));
    await expectAccepted(page, seed);

    // The checkpoint interval takes the engine's range, as `loci fit --checkpoint-every` does (src/engine/runSpec.ts).
    const every = page.getByLabel('Checkpoint every', { exact: true });
    await type(every, '0.5');
    await expectRefused(page, every, '0.5', /^Checkpoint every: 0\.5 s is under 1 s .*; expected a time from 1 s to 86,400 s \(a day\)/);
    await type(every, '2.5');
    await expectAccepted(page, every);
    expect(await every.inputValue()).toBe('2.5');

    // A transmission angle lies between 0° and 90° (common practice: the acute angle between coupler and output link).
    await type(angle, '100');
    await expectRefused(page, angle, '100', /^Minimum transmission angle: 100° is above 90°/);
    await shoot(page, angle, 'inputs-transmission-angle');
    // Several at once: each is listed under Start.
    await type(seed, '-1');
    expect(await page.getByTestId('start-issues').locator('li').count()).toBe(2);
    await saveScreenshot(page, 'inputs-start-list', { fullPage: true });
    await type(angle, '40');
    await type(seed, '7');
    await expectAccepted(page, angle);

    // Nothing was clamped: the values kept are exactly the ones last typed.
    expect(await budget.inputValue()).toBe('3000');
    expect(await angle.inputValue()).toBe('40');
    expect(await runStatus(page)).toBe('idle');
    expect(app.problems()).toEqual([]);
  });

  it('takes link lengths field by field, never filling in the other', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    const from = page.getByLabel('Shortest link length (mm)');
    const to = page.getByLabel('Longest link length (mm)');
    await type(from, '50');
    expect(await to.inputValue()).toBe('');
    await expectRefused(page, to, '', /^Longest link length: empty; give both lengths, or empty both for no limit/);
    expect(await from.getAttribute('aria-invalid')).toBe('false');
    await shoot(page, to, 'inputs-link-lengths');
    await type(to, '30');
    await expectRefused(page, to, '30', /^Longest link length: 30 mm is not above the shortest, 50 mm/);
    await type(to, '400');
    await expectAccepted(page, to);
    expect(await from.inputValue()).toBe('50');
    expect(await to.inputValue()).toBe('400');
    await type(from, '');
    await expectRefused(page, from, '', /^Shortest link length: empty/);
    await type(to, '');
    await expectAccepted(page, to);
    expect(app.problems()).toEqual([]);
  });

  it('refuses bounds that are equal, reversed or beyond the size a problem takes, naming the variable', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await openBounds(page);
    const lower = page.getByLabel('A0.x, lower bound');
    const upper = page.getByLabel('A0.x, upper bound');
    // A default bound reads as a person writes it, not as a float sum (20.899999999999977): ten significant digits at most.
    for (const field of await page.locator('.bounds-table input').all()) {
      expect((await field.inputValue()).replace(/^-|\.|e.*$/g, '').replace(/^0+/, '').length).toBeLessThanOrEqual(10);
    }

    await type(lower, '5');
    await type(upper, '5');
    await expectRefused(page, upper, '5', /^four-bar A0\.x: the lower and upper bounds are both 5 mm; expected the lower bound below the upper/);
    await shoot(page, upper, 'inputs-bounds-equal');

    await type(lower, '10');
    const reversed = await expectRefused(page, upper, '5', /^four-bar A0\.x: the lower bound 10 mm is above the upper bound 5 mm/);
    expect(reversed).toMatch(/swap them/);
    // Not swapped behind the user's back.
    expect(await lower.inputValue()).toBe('10');

    // Beyond the largest bound the problem reader takes (MAX_BOUND_MAGNITUDE, src/core/synthesis/problem.ts).
    const limit = MAX_BOUND_MAGNITUDE.toLocaleString('en-GB');
    await type(lower, '-1e308');
    await type(upper, '1e308');
    await expectRefused(page, lower, '-1e308', new RegExp(`^four-bar A0\\.x, lower bound: -1e308 mm is beyond ±${limit} mm`));
    await expectRefused(page, upper, '1e308', new RegExp(`^four-bar A0\\.x, upper bound: 1e308 mm is beyond ±${limit} mm`));
    await shoot(page, lower, 'inputs-bounds-huge');

    await type(lower, '-100');
    await type(upper, '100');
    await expectAccepted(page, upper);
    // Kept as typed: the row is marked as the user's own, and a reset is offered.
    expect(await page.getByRole('button', { name: 'Reset the bounds of A0.x' }).count()).toBe(1);
    expect(await runStatus(page)).toBe('idle');
    expect(app.problems()).toEqual([]);
  });

  it('labels the pivot bounds of several families once, where their boxes are the same', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await page.getByLabel(/Fixed: the pivots are searched/).check();
    const families = page.getByRole('group', { name: /^Mechanism families/ });
    await families.locator('label.family', { hasText: 'Watt I six-bar' }).locator('input').check();
    await families.locator('label.family', { hasText: 'Stephenson III six-bar' }).locator('input').check();
    // The default pivot boxes are the same for every family: one rectangle, one label naming them all.
    await expect.poll(() => page.getByTestId('bound-region').count()).toBe(1);
    expect(await page.getByTestId('bound-region').locator('text').textContent()).toBe('A0, B0 (four-bar, Watt I six-bar); A0, B0, C0 (Stephenson III six-bar)');
    expect(app.problems()).toEqual([]);
  });

  it('takes a keep-out circle typed in, exactly as typed', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    const x = page.getByLabel('Keep-out circle, centre x (mm)');
    const y = page.getByLabel('Keep-out circle, centre y (mm)');
    const r = page.getByLabel('Keep-out circle, radius (mm)');
    await x.fill('12.345');
    await y.fill('-20');
    await r.fill('0');
    await expect.poll(() => page.locator('.keep-out-new [data-testid="field-error"]').textContent()).toMatch(/^Keep-out circle, radius: 0 mm is not above 0/);
    expect(await startButton(page).isDisabled()).toBe(true);
    await shoot(page, r, 'inputs-keep-out-radius');
    await r.fill('7.5');
    await page.getByRole('button', { name: 'Add keep-out circle' }).click();
    await expect.poll(() => page.getByTestId('keep-out-region').count()).toBe(1);
    expect(await page.locator('.keep-out-list li').first().textContent()).toMatch(/^1: centre \(12\.345, -20\) mm, radius 7\.5 mm/);
    expect(await x.inputValue()).toBe('');
    await expect.poll(() => startButton(page).isDisabled()).toBe(false);
    expect(app.problems()).toEqual([]);
  });
});

describeBrowser('state that tells the truth', () => {
  const browser = useBrowser();

  it('keeps an edited project name across a reload, and refuses an empty one', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await page.getByRole('button', { name: 'Rename project' }).click();
    const name = page.getByLabel('Project name');
    await type(name, '');
    await expectRefused(page, name, '', /^Project name: empty; expected a name for the project/);
    await saveScreenshot(page, 'inputs-project-name-empty');
    await type(name, 'Gate lifter, trial 3');
    // Accepted: the field closes, and the name is the workspace's title.
    await expect.poll(() => name.count()).toBe(0);
    await expect.poll(() => startButton(page).isDisabled()).toBe(false);
    expect(await page.getByTestId('project-name').textContent()).toContain('Gate lifter, trial 3');
    await expect.poll(() => savedProjectName(page)).toBe('Gate lifter, trial 3');
    await page.reload();
    await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    expect(await page.getByTestId('project-name').textContent()).toContain('Gate lifter, trial 3');
    expect(app.problems()).toEqual([]);
  });

  it('marks the results of a previous target, and clears what belonged to its frame, offering it back', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await type(page.getByLabel('Budget in evaluations'), '2000');
    await page.getByLabel('Keep-out circle, centre x (mm)').fill('0');
    await page.getByLabel('Keep-out circle, centre y (mm)').fill('0');
    await page.getByLabel('Keep-out circle, radius (mm)').fill('5');
    await page.getByRole('button', { name: 'Add keep-out circle' }).click();
    await startButton(page).click();
    expect(await waitForStatus(page, ['finished', 'failed'])).toBe('finished');
    await expect.poll(() => page.getByTestId('candidate-row').count(), { timeout: 30_000 }).toBeGreaterThan(0);
    // The results are this target's: no marker.
    expect(await page.getByTestId('results-previous-target').count()).toBe(0);
    expect(await page.getByTestId('run-previous-target').count()).toBe(0);

    await pasteCsv(page, 'x,y\n0,0\n40,10\n80,5\n120,30\n160,20');
    await expect.poll(() => page.getByTestId('point-row').count()).toBe(5);
    const marker = page.getByTestId('results-previous-target');
    await marker.waitFor();
    expect(await marker.textContent()).toMatch(/These results are for the previous target \(24 points, closed loop\)/);
    expect(await page.getByTestId('run-previous-target').textContent()).toMatch(/previous target \(24 points\)/);
    // The keep-out circle was set in the old target's frame: cleared, and offered back.
    expect(await page.getByTestId('keep-out-region').count()).toBe(0);
    expect(await page.getByTestId('set-aside').textContent()).toMatch(/New target: cleared what was set in the previous target's frame \(1 keep-out region\)/);
    await saveScreenshot(page, 'inputs-previous-target', { fullPage: true });
    await page.getByRole('button', { name: 'Keep them for this target' }).click();
    await expect.poll(() => page.getByTestId('keep-out-region').count()).toBe(1);
    expect(await page.getByTestId('set-aside').count()).toBe(0);
    expect(app.problems()).toEqual([]);
  }, SEARCH_TEST_MS);

  it('says "Resumed after a reload" only after a reload, not after Pause and Resume or Stop', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    const resumed = page.getByTestId('run-resumed');
    await type(page.getByLabel('Budget in evaluations'), '5000000');
    await startButton(page).click();
    await waitForStatus(page, ['running']);
    await page.getByRole('button', { name: 'Pause' }).click();
    await waitForStatus(page, ['paused']);
    await page.getByRole('button', { name: 'Resume' }).click();
    await waitForStatus(page, ['running']);
    expect(await resumed.count()).toBe(0);

    // A checkpoint to go on from, then the reload.
    await page.getByTestId('run-checkpoint').waitFor({ timeout: SEARCH_TIMEOUT_MS });
    await page.reload();
    await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    await resumed.waitFor({ timeout: SEARCH_TIMEOUT_MS });
    expect(await resumed.textContent()).toMatch(/^Resumed after a reload from the checkpoint of round \d+/);
    await saveScreenshot(page, 'inputs-resumed-after-reload');

    await page.getByRole('button', { name: 'Pause' }).click();
    await waitForStatus(page, ['paused']);
    expect(await resumed.count()).toBe(0);
    await page.getByRole('button', { name: 'Resume' }).click();
    await waitForStatus(page, ['running']);
    expect(await resumed.count()).toBe(0);
    await page.getByRole('button', { name: 'Stop' }).click();
    expect(await waitForStatus(page, ['finished', 'failed'])).toBe('finished');
    expect(await resumed.count()).toBe(0);
    expect(app.problems()).toEqual([]);
  }, LONG_SEARCH_TEST_MS);
});
