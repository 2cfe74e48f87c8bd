/**
 * The tab's title while a search runs: progress, best error and state first, so a user
 * with many tabs sees how a long search is going without opening its tab.
 */
import type { RunState } from '../state/project';

export const APP_TITLE = 'Loci';

/** Share of the budget used, 0 … 1, from evaluations or from time; null without a budget to measure against. */
function shareDone(run: RunState): number | null {
  if (run.budgetEvaluations !== null && run.budgetEvaluations > 0) return run.evaluations / run.budgetEvaluations;
  if (run.budgetSeconds !== null && run.budgetSeconds > 0) return run.elapsedMs / (run.budgetSeconds * 1000);
  return null;
}

function bestText(run: RunState): string | null {
  if (run.bestErrorMm === null || !Number.isFinite(run.bestErrorMm)) return null;
  return `${run.bestErrorMm.toFixed(3)} mm${run.withTerms ? ' with terms' : ''}${run.bestFeasible === false ? ' (infeasible)' : ''}`;
}

export function runTitle(run: RunState): string {
  const best = bestText(run);
  const parts: string[] = [];
  switch (run.status) {
    case 'idle':
      return APP_TITLE;
    case 'starting':
      parts.push('Starting');
      break;
    case 'running': {
      const share = shareDone(run);
      parts.push(share === null ? 'Searching' : `${Math.min(99, Math.floor(share * 100))} %`);
      break;
    }
    case 'pausing':
    case 'paused':
      parts.push('Paused');
      break;
    case 'stopping':
      parts.push('Stopping');
      break;
    case 'finished':
      parts.push('Done');
      break;
    case 'failed':
      parts.push('Stopped');
      break;
  }
  if (best !== null) parts.push(best);
  parts.push(APP_TITLE);
  return parts.join(' · ');
}
