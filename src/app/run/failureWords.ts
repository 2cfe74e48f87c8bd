/** What a search's failure says to the user: what happened in words, and the engine's reason (workers unnamed) apart. */
export function failureWords(what: 'start' | 'stopped' | 'resume', reason: string): { message: string; messageDetail: string } {
  const refused = /\bworker \d+ refused\b/.test(reason);
  const lost = /\bworker \d+ failed\b/.test(reason);
  const head = what === 'start' ? 'The search could not start' : what === 'resume' ? 'The search could not resume' : 'The search stopped before its end';
  const why = refused
    ? 'the search workers refused this problem. Check the target and the search settings, then start again.'
    : lost
      ? 'a search worker stopped working and could not be replaced (the browser may be short of memory). The results so far are kept; start again, perhaps with fewer workers.'
      : what === 'resume'
        ? 'no checkpoint of it could be read back whole. The results so far are kept; start the search again.'
        : 'an unexpected problem. The results so far are kept; start again, and if it happens again, note the details below.';
  // The engine names its workers and calls ("worker 0 refused init: …"); the reason after them is what matters.
  const detail = reason.replace(/\bworker \d+ (?:refused [\w -]+?|failed): /g, '').trim();
  return { message: `${head}: ${why}`, messageDetail: detail.length > 0 ? detail : reason };
}
