/**
 * Bounds that are positions: a pair of variables `<joint>.x` and `<joint>.y` (mm) of a
 * family bounds a pivot to a rectangle, which the drawing shows. Other variables
 * (lengths, angles) have no place on the drawing.
 */
import { familyLabel, type FamilyId } from '../state/families';

export interface PositionRegion {
  readonly key: string;
  readonly label: string;
  readonly minX: number;
  readonly maxX: number;
  readonly minY: number;
  readonly maxY: number;
}

export interface FamilyBounds {
  readonly family: FamilyId;
  readonly variableNames: readonly string[];
  readonly lower: readonly number[];
  readonly upper: readonly number[];
}

const POSITION_NAME = /^(.+?)[._]?([xy])(?:_?mm)?$/i;

export function positionRegions(bounds: readonly FamilyBounds[]): PositionRegion[] {
  const regions: PositionRegion[] = [];
  for (const b of bounds) {
    const byJoint = new Map<string, { x?: [number, number]; y?: [number, number] }>();
    b.variableNames.forEach((name, k) => {
      const m = POSITION_NAME.exec(name);
      if (m === null) return;
      const entry = byJoint.get(m[1]) ?? {};
      entry[m[2].toLowerCase() as 'x' | 'y'] = [b.lower[k], b.upper[k]];
      byJoint.set(m[1], entry);
    });
    // Pivots with the same box share one rectangle and one label ("A0, B0").
    const byBox = new Map<string, { joints: string[]; x: [number, number]; y: [number, number] }>();
    for (const [joint, { x, y }] of byJoint) {
      if (x === undefined || y === undefined) continue;
      const key = `${x[0]},${x[1]},${y[0]},${y[1]}`;
      const entry = byBox.get(key);
      if (entry === undefined) byBox.set(key, { joints: [joint], x, y });
      else entry.joints.push(joint);
    }
    for (const { joints, x, y } of byBox.values()) {
      regions.push({ key: `${b.family}:${joints.join('+')}`, label: `${joints.join(', ')} (${familyLabel(b.family)})`, minX: x[0], maxX: x[1], minY: y[0], maxY: y[1] });
    }
  }
  return regions;
}
