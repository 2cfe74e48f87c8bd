import { expect, it } from 'vitest';
import { describeBrowser, saveScreenshot, useBrowser } from './harness';

// The wording the page must show, as the project's brief states it (not read from the app).
const TITLE = 'Loci';
const CAUTION =
  'Loci computes kinematics only: no strength, stiffness or fatigue. A frame or walking machine must be checked by a qualified engineer and tested to the applicable standards (for bicycles, the ISO 4210 series) before anyone uses it.';

describeBrowser('app page in headless Chromium', () => {
  const browser = useBrowser();

  it('loads with no errors, shows the title and the caution, and asks no other origin', async () => {
    const app = await browser.openApp('/', { waitUntil: 'networkidle' });

    await expect(app.page.title()).resolves.toBe(TITLE);
    await expect(app.page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe(TITLE);
    const caution = app.page.getByRole('note', { name: 'Caution' });
    expect(await caution.isVisible()).toBe(true);
    expect(await caution.textContent()).toContain(CAUTION);

    // The recorder saw the page itself and its script, so an empty foreign list means something.
    const ownPaths = app.requests.map((request) => new URL(request.url).pathname);
    expect(ownPaths).toContain('/');
    expect(ownPaths.some((path) => path.startsWith('/assets/') && path.endsWith('.js'))).toBe(true);
    expect(app.problems()).toEqual([]);

    await saveScreenshot(app.page, 'app-start');
  });
});
