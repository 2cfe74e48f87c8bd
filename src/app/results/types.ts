/** The target as the results views take it: points in mm, in order, and whether the path closes. */
export interface ResultsTarget {
  readonly points: readonly (readonly [number, number])[];
  readonly closed: boolean;
}

/** Same points and closure, whether or not the objects are the same. */
export function sameTarget(a: ResultsTarget, b: ResultsTarget): boolean {
  if (a === b) return true;
  if (a.closed !== b.closed || a.points.length !== b.points.length) return false;
  return a.points.every((p, i) => p[0] === b.points[i][0] && p[1] === b.points[i][1]);
}
