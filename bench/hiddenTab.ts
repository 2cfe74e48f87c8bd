/**
 * A search's evaluations per second with its tab hidden against the same run's with it
 * visible: the built app in headless Chromium, one long search on the opening demo, the
 * tab hidden and shown in turns (visible, hidden, hidden, visible, then the mirror image,
 * twice: a steady drift of the search's speed, or of the machine's load, weighs on both
 * alike), each block read from the run's own progress reports on the engine's clock.
 * Short blocks, many of them: the search's speed wanders (restarts, checkpoints), and
 * more turns follow it closer.
 *
 * Needs Chromium (`LOCI_CHROMIUM`, or /usr/bin/chromium); builds the app as the browser
 * tests do.
 */
import { launchPipedChromium, progressOver, showApp, startSearch } from '../tests/browser/devtoolsPipe';
import { withServedApp } from './servedApp';

const LONG_BUDGET = '5000000';
/** Checkpoints every 2 s: each block holds one or two, about as many as the next. */
const CHECKPOINT_EVERY_S = '2';
/** One block of the measure, ms. */
const BLOCK_MS = 3_500;
/** Which blocks are hidden: each half of the measure, the other's mirror image. */
const HIDDEN_BLOCKS = [false, true, true, false, true, false, false, true, false, true, true, false, true, false, false, true];

const mean = (xs: readonly number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;

export async function benchHiddenTab(): Promise<Record<string, number>> {
  return withServedApp(async (baseUrl) => {
    const chromium = await launchPipedChromium();
    try {
      const app = await chromium.openTab(baseUrl);
      const other = await chromium.openTab('about:blank');
      await chromium.front(app);
      await startSearch(app, LONG_BUDGET, CHECKPOINT_EVERY_S);
      const rates = { visible: [] as number[], hidden: [] as number[] };
      for (const hidden of HIDDEN_BLOCKS) {
        await showApp(chromium, app, other, hidden);
        const { start, end } = await progressOver(app, BLOCK_MS);
        if ((await app.evaluate<string>('document.visibilityState')) !== (hidden ? 'hidden' : 'visible')) throw new Error('the tab changed visibility within a block');
        (hidden ? rates.hidden : rates.visible).push(((end.evaluations - start.evaluations) * 1000) / (end.elapsedMs - start.elapsedMs));
      }
      return {
        visibleEvaluationsPerS: mean(rates.visible),
        hiddenEvaluationsPerS: mean(rates.hidden),
        hiddenOverVisibleRatio: mean(rates.hidden) / mean(rates.visible),
        slowestHiddenOverMeanVisibleRatio: Math.min(...rates.hidden) / mean(rates.visible),
      };
    } finally {
      await chromium.close();
    }
  });
}
