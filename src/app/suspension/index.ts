/**
 * The rear-suspension views: `SuspensionEntry` opens a workspace on its own store (the
 * demo unless a state is given); `SuspensionCaution` is the caution every view shows;
 * `stored.ts` is the form the project keeps.
 */
export { SuspensionEntry } from './SuspensionEntry';
export { SuspensionStart } from './SuspensionStart';
export { SuspensionCaution } from './SuspensionWorkspace';
export { demoSuspensionState, reduceSuspension } from './state';
export type { SuspensionState } from './state';
export { stateOf, storedOf, storedSuspensionSchema } from './stored';
export type { StoredSuspension } from './stored';
