/**
 * The error an island throws when its objective throws while evaluating a design: a bug
 * in an objective, or an input it was never meant to see. Its name survives the worker
 * boundary (comlink keeps a thrown error's name and message), so the engine can end the
 * run with this message and the best results so far instead of failing as on a bug.
 */
export const OBJECTIVE_ERROR_NAME = 'ObjectiveError';

/** Designs shown in a message: this many significant digits per coordinate. */
const DIGITS = 6;

export class ObjectiveError extends Error {
  override readonly name = OBJECTIVE_ERROR_NAME;
}

/** The error for `thrown`, raised by the objective of `islandId` on design `x`. */
export function objectiveError(islandId: string, x: ArrayLike<number>, thrown: unknown): ObjectiveError {
  const what = thrown instanceof Error ? `${thrown.name}: ${thrown.message}` : String(thrown);
  const design = Array.from(x, (v) => Number(v.toPrecision(DIGITS))).join(', ');
  return new ObjectiveError(`the objective of island ${islandId} threw on the design [${design}]: ${what}`);
}

/** Whether `error` (possibly copied across a worker boundary) is an ObjectiveError. */
export function isObjectiveError(error: unknown): error is Error {
  return error instanceof Error && error.name === OBJECTIVE_ERROR_NAME;
}
