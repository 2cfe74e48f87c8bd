/**
 * A demo leg of our own invention: one leg of a small crank-driven walking toy, a
 * four-bar a few centimetres across. Crank 8 mm turning clockwise, a rocker of about
 * 18 mm from a hip pivot 24 mm ahead of and 8 mm below the crank shaft, and the foot on
 * the coupler's extension about 30 mm below the shaft. It walks towards +x on a level
 * ground line just above the foot path's lowest point.
 */
import { fourBar, type Linkage } from '../linkage';
import type { LegSpec } from './leg';

export const DEMO_TOY_LEG_LINKAGE: Linkage = fourBar({
  A0: { x: 0, y: 0 },
  B0: { x: 24, y: -8 },
  A: { x: 8, y: 0 },
  B: { x: 33, y: 8 },
  P: { x: 20, y: -30 },
});

export const DEMO_TOY_LEG: LegSpec = {
  foot: 'P',
  ground: { kind: 'level', yMm: -30.9 },
  stanceToleranceMm: 1,
  crankDirection: -1,
  walkingDirection: 1,
};
