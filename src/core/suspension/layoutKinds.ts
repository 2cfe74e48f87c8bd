/**
 * The layout kinds as data: each kind's id, its name in the trade's generic words, the
 * pivots it is drawn with (its builder's positions without the rear axle), its builder,
 * and the demo drawing of it on the demo bicycle. One source of truth for the kinds a
 * design file names and a suspension search tries.
 */
import type { Vec2 } from '../geometry';
import type { Linkage } from '../linkage';
import { DEMO_LAYOUTS } from './demo';
import {
  DEFAULT_SHOCK_BODIES,
  fourBarSeatStayAxle,
  linkageDrivenSinglePivot,
  shortLinkFourBar,
  singlePivot,
  stephensonSixBar,
  wattSixBar,
  type FourBarSeatStayAxlePositions,
  type LinkageDrivenSinglePivotPositions,
  type ShortLinkFourBarPositions,
  type SinglePivotPositions,
  type StephensonSixBarPositions,
  type WattSixBarPositions,
  type ShockBodies,
  type SixBarBody,
} from './layouts';

export const LAYOUT_KINDS = [
  'singlePivot',
  'linkageDrivenSinglePivot',
  'fourBarSeatStayAxle',
  'shortLinkFourBar',
  'wattSixBar',
  'stephensonSixBar',
] as const;
export type LayoutKind = (typeof LAYOUT_KINDS)[number];

/** Each kind in the trade's generic words, as tables and reports name it. */
export const LAYOUT_NAMES: Readonly<Record<LayoutKind, string>> = {
  singlePivot: 'single pivot',
  linkageDrivenSinglePivot: 'linkage-driven single pivot',
  fourBarSeatStayAxle: 'four-bar, axle on the seat stay',
  shortLinkFourBar: 'short-link four-bar',
  wattSixBar: 'Watt six-bar',
  stephensonSixBar: 'Stephenson six-bar',
};

type Pivots<T> = Omit<T, 'axle' | 'axleBody' | 'shock'>;
type PivotNames<T> = readonly (keyof Pivots<T>)[];

/** The pivots each kind is drawn with (its builder's positions without the axle); each is a joint id of its linkage. */
export const LAYOUT_PIVOTS: { readonly [K in LayoutKind]: readonly string[] } = {
  singlePivot: ['mainPivot', 'shockEye', 'shockFrameEye'] satisfies PivotNames<SinglePivotPositions>,
  linkageDrivenSinglePivot: ['mainPivot', 'armLinkPin', 'rockerPivot', 'rockerLinkPin', 'shockEye', 'shockFrameEye'] satisfies PivotNames<LinkageDrivenSinglePivotPositions>,
  fourBarSeatStayAxle: ['mainPivot', 'stayPivot', 'rockerPivot', 'rockerStayPin', 'shockEye', 'shockFrameEye'] satisfies PivotNames<FourBarSeatStayAxlePositions>,
  shortLinkFourBar: ['lowerPivot', 'lowerLinkPin', 'upperPivot', 'upperLinkPin', 'shockEye', 'shockFrameEye'] satisfies PivotNames<ShortLinkFourBarPositions>,
  wattSixBar: [
    'mainPivot', 'stayPivot', 'rockerPivot', 'rockerStayPin', 'rockerLinkPin', 'bellCrankPivot', 'bellCrankLinkPin', 'shockEye', 'shockFrameEye',
  ] satisfies PivotNames<WattSixBarPositions>,
  stephensonSixBar: [
    'mainPivot', 'stayPivot', 'rockerPivot', 'rockerStayPin', 'stayLinkPin', 'bellCrankPivot', 'bellCrankLinkPin', 'shockEye', 'shockFrameEye',
  ] satisfies PivotNames<StephensonSixBarPositions>,
};

/** The body the six-bars carry the axle on (any moving body); the other kinds have one axle-carrying body. */
export type LayoutAxleBody = SixBarBody;

/** Whether a kind lets the designer choose the axle's body and the shock's bodies. */
export function hasBodyChoice(kind: LayoutKind): kind is 'wattSixBar' | 'stephensonSixBar' {
  return kind === 'wattSixBar' || kind === 'stephensonSixBar';
}

/**
 * The kind's linkage from its pivots (LAYOUT_PIVOTS[kind], each present) and the bicycle's
 * rear axle; for the six-bars, the axle's body and the shock's bodies (the other kinds ignore them).
 */
export function buildLayout(
  kind: LayoutKind,
  pivots: Readonly<Record<string, Vec2>>,
  axle: Vec2,
  axleBody: LayoutAxleBody = 'seatStay',
  shock: ShockBodies = DEFAULT_SHOCK_BODIES,
): Linkage {
  const p = pivots as never;
  switch (kind) {
    case 'singlePivot': return singlePivot({ ...(p as Pivots<SinglePivotPositions>), axle });
    case 'linkageDrivenSinglePivot': return linkageDrivenSinglePivot({ ...(p as Pivots<LinkageDrivenSinglePivotPositions>), axle });
    case 'fourBarSeatStayAxle': return fourBarSeatStayAxle({ ...(p as Pivots<FourBarSeatStayAxlePositions>), axle });
    case 'shortLinkFourBar': return shortLinkFourBar({ ...(p as Pivots<ShortLinkFourBarPositions>), axle });
    case 'wattSixBar': return wattSixBar({ ...(p as Pivots<WattSixBarPositions>), axle, axleBody, shock });
    case 'stephensonSixBar': return stephensonSixBar({ ...(p as Pivots<StephensonSixBarPositions>), axle, axleBody, shock });
  }
}

/** The demo drawing of each kind on the demo bicycle (DEMO_LAYOUTS), pivots only. */
export function demoPivots(kind: LayoutKind): Readonly<Record<string, Vec2>> {
  const drawn = DEMO_LAYOUTS[kind] as unknown as Readonly<Record<string, Vec2>>;
  const out: Record<string, Vec2> = {};
  for (const name of LAYOUT_PIVOTS[kind]) out[name] = { x: drawn[name].x, y: drawn[name].y };
  return out;
}

/** The axle-carrying body of the demo drawing of a six-bar, or the default. */
export function demoAxleBody(kind: LayoutKind): LayoutAxleBody {
  const drawn = DEMO_LAYOUTS[kind] as { readonly axleBody?: LayoutAxleBody };
  return drawn.axleBody ?? 'seatStay';
}
