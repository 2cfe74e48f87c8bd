/**
 * The reference Nelder–Mead of the `fmin` package (0.0.4), loaded so it works in Node.
 *
 * Its package points `main` at a UMD bundle inside a `"type": "module"` package, so Node
 * loads the bundle as an ES module: it exports nothing and installs `globalThis.fmin`
 * instead. Its ES sources import without file extensions, which Node cannot resolve.
 * Hence: import the bundle for its effect, then take the global (or the named export,
 * should a later version provide it).
 */
import * as fminModule from 'fmin';

type Fmin = typeof fminModule;

function load(): Fmin {
  if (typeof fminModule.nelderMead === 'function') return fminModule;
  const installed = (globalThis as { fmin?: Fmin }).fmin;
  if (installed === undefined || typeof installed.nelderMead !== 'function') {
    throw new Error('fmin did not load: neither a nelderMead export nor globalThis.fmin');
  }
  return installed;
}

export const fmin: Fmin = load();
