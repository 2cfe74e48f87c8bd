/**
 * The walking-leg workspace: `LegEntry` opens it on its own store, `LegStart` is its
 * way in from the start page, and `stored.ts` is the form the project keeps. The views
 * of a leg design are in views/.
 */
export { LegEntry } from './LegEntry';
export { LegStart } from './LegStart';
export { storedLegOf, storedLegSchema } from './stored';
export type { StoredLeg } from './stored';
export type { LegState } from './state';
