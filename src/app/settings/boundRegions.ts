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

/** The unit of a variable as the bounds editor shows it: mm for a position, none for what has no fixed unit. */
export function variableUnit(name: string): string {
  return POSITION_NAME.test(name) ? 'mm' : '';
}

/**
 * One rectangle per distinct box, whichever families it comes from, so the labels of
 * several families do not print over each other: "A0, B0 (four-bar, Watt I six-bar);
 * A0, B0, C0 (Stephenson III six-bar)".
 */
export function positionRegions(bounds: readonly FamilyBounds[]): PositionRegion[] {
  const byBox = new Map<string, { x: [number, number]; y: [number, number]; groups: Map<string, { joints: string[]; families: FamilyId[] }> }>();
  for (const b of bounds) {
    const byJoint = new Map<string, { x?: [number, number]; y?: [number, number] }>();
    b.variableNames.forEach((name, k) => {
      const m = POSITION_NAME.exec(name);
      if (m === null) return;
      const entry = byJoint.get(m[1]) ?? {};
      entry[m[2].toLowerCase() as 'x' | 'y'] = [b.lower[k], b.upper[k]];
      byJoint.set(m[1], entry);
    });
    const jointsByBox = new Map<string, { joints: string[]; x: [number, number]; y: [number, number] }>();
    for (const [joint, { x, y }] of byJoint) {
      if (x === undefined || y === undefined) continue;
      const key = `${x[0]},${x[1]},${y[0]},${y[1]}`;
      const entry = jointsByBox.get(key);
      if (entry === undefined) jointsByBox.set(key, { joints: [joint], x, y });
      else entry.joints.push(joint);
    }
    for (const [key, { joints, x, y }] of jointsByBox) {
      const box = byBox.get(key) ?? { x, y, groups: new Map() };
      byBox.set(key, box);
      const group = box.groups.get(joints.join(', '));
      if (group === undefined) box.groups.set(joints.join(', '), { joints, families: [b.family] });
      else group.families.push(b.family);
    }
  }
  return [...byBox.entries()].map(([key, { x, y, groups }]) => ({
    key,
    label: [...groups.values()].map((g) => `${g.joints.join(', ')} (${g.families.map(familyLabel).join(', ')})`).join('; '),
    minX: x[0],
    maxX: x[1],
    minY: y[0],
    maxY: y[1],
  }));
}
