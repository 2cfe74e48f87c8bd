/**
 * Rear-suspension layouts as linkages. Each builder takes pivot positions (mm, bicycle
 * frame: origin at the bottom bracket, x forward, y up) drawn at full extension and
 * returns a Linkage whose ground body is the front frame, driven by the shock's eye-to-eye
 * length (joint `shockEye` on the suspension to joint `shockFrameEye`, on the front frame
 * or, in the six-bars, on a chosen moving body), with the
 * rear axle as the point `axle` on the axle-carrying body.
 *
 * Generic names only: single pivot, linkage-driven single pivot, four-bar with the axle
 * on the seat stay, short-link four-bar, Watt six-bar, Stephenson six-bar.
 */
import type { Vec2 } from '../geometry';
import { GROUND, type Linkage } from '../linkage';


/** The id of the rear-axle point every layout carries. */
export const AXLE_POINT = 'axle';
/** Joint ids of the shock's eyes: on the suspension, and on the front frame (or a six-bar's chosen body). */
export const SHOCK_EYE = 'shockEye';
export const SHOCK_FRAME_EYE = 'shockFrameEye';
/** The front frame is the linkage's ground body. */
export const FRONT_FRAME = GROUND;


function fixed(id: string, p: Vec2) {
  return { id, x: p.x, y: p.y, ground: true };
}

function free(id: string, p: Vec2) {
  return { id, x: p.x, y: p.y };
}

function axleOn(body: string, p: Vec2) {
  return [{ id: AXLE_POINT, body, x: p.x, y: p.y }];
}

const SHOCK_DRIVER = { kind: 'length', from: SHOCK_EYE, to: SHOCK_FRAME_EYE } as const;

/** Single pivot: the axle on a swinging arm about `mainPivot`; the shock from the arm to the front frame. */
export interface SinglePivotPositions {
  readonly mainPivot: Vec2;
  readonly axle: Vec2;
  /** The shock's eye on the arm. */
  readonly shockEye: Vec2;
  readonly shockFrameEye: Vec2;
}

/** Bodies: `swingArm` [mainPivot, shockEye] carrying the axle. */
export function singlePivot(at: SinglePivotPositions): Linkage {
  return {
    joints: [fixed('mainPivot', at.mainPivot), fixed(SHOCK_FRAME_EYE, at.shockFrameEye), free(SHOCK_EYE, at.shockEye)],
    bodies: [{ id: 'swingArm', joints: ['mainPivot', SHOCK_EYE] }],
    points: axleOn('swingArm', at.axle),
    driver: SHOCK_DRIVER,
  };
}

/**
 * Linkage-driven single pivot: the swinging arm drives a rocker through a link; the
 * shock runs from the rocker to the front frame.
 */
export interface LinkageDrivenSinglePivotPositions {
  readonly mainPivot: Vec2;
  readonly axle: Vec2;
  /** Where the link meets the arm. */
  readonly armLinkPin: Vec2;
  readonly rockerPivot: Vec2;
  /** Where the link meets the rocker. */
  readonly rockerLinkPin: Vec2;
  /** The shock's eye on the rocker. */
  readonly shockEye: Vec2;
  readonly shockFrameEye: Vec2;
}

/** Bodies: `swingArm` [mainPivot, armLinkPin] carrying the axle, `link` [armLinkPin, rockerLinkPin], `rocker` [rockerPivot, rockerLinkPin, shockEye]. */
export function linkageDrivenSinglePivot(at: LinkageDrivenSinglePivotPositions): Linkage {
  return {
    joints: [
      fixed('mainPivot', at.mainPivot),
      fixed('rockerPivot', at.rockerPivot),
      fixed(SHOCK_FRAME_EYE, at.shockFrameEye),
      free('armLinkPin', at.armLinkPin),
      free('rockerLinkPin', at.rockerLinkPin),
      free(SHOCK_EYE, at.shockEye),
    ],
    bodies: [
      { id: 'swingArm', joints: ['mainPivot', 'armLinkPin'] },
      { id: 'link', joints: ['armLinkPin', 'rockerLinkPin'] },
      { id: 'rocker', joints: ['rockerPivot', 'rockerLinkPin', SHOCK_EYE] },
    ],
    points: axleOn('swingArm', at.axle),
    driver: SHOCK_DRIVER,
  };
}

/**
 * Four-bar with the axle on the seat stay (the coupler): the chain stay pivots on the
 * front frame at `mainPivot` and meets the seat stay at `stayPivot`; the seat stay meets
 * the rocker at `rockerStayPin`; the shock runs from the rocker to the front frame.
 */
export interface FourBarSeatStayAxlePositions {
  readonly mainPivot: Vec2;
  readonly stayPivot: Vec2;
  readonly rockerPivot: Vec2;
  readonly rockerStayPin: Vec2;
  readonly shockEye: Vec2;
  readonly shockFrameEye: Vec2;
  readonly axle: Vec2;
}

/** Bodies: `chainStay` [mainPivot, stayPivot], `seatStay` [stayPivot, rockerStayPin] carrying the axle, `rocker` [rockerPivot, rockerStayPin, shockEye]. */
export function fourBarSeatStayAxle(at: FourBarSeatStayAxlePositions): Linkage {
  return {
    joints: [
      fixed('mainPivot', at.mainPivot),
      fixed('rockerPivot', at.rockerPivot),
      fixed(SHOCK_FRAME_EYE, at.shockFrameEye),
      free('stayPivot', at.stayPivot),
      free('rockerStayPin', at.rockerStayPin),
      free(SHOCK_EYE, at.shockEye),
    ],
    bodies: [
      { id: 'chainStay', joints: ['mainPivot', 'stayPivot'] },
      { id: 'seatStay', joints: ['stayPivot', 'rockerStayPin'] },
      { id: 'rocker', joints: ['rockerPivot', 'rockerStayPin', SHOCK_EYE] },
    ],
    points: axleOn('seatStay', at.axle),
    driver: SHOCK_DRIVER,
  };
}

/**
 * Short-link four-bar: two short links on the front frame carry a long rear triangle
 * with the axle; the shock runs from the upper link to the front frame.
 */
export interface ShortLinkFourBarPositions {
  readonly lowerPivot: Vec2;
  readonly lowerLinkPin: Vec2;
  readonly upperPivot: Vec2;
  readonly upperLinkPin: Vec2;
  /** The shock's eye on the upper link. */
  readonly shockEye: Vec2;
  readonly shockFrameEye: Vec2;
  readonly axle: Vec2;
}

/** Bodies: `lowerLink` [lowerPivot, lowerLinkPin], `upperLink` [upperPivot, upperLinkPin, shockEye], `rearTriangle` [lowerLinkPin, upperLinkPin] carrying the axle. */
export function shortLinkFourBar(at: ShortLinkFourBarPositions): Linkage {
  return {
    joints: [
      fixed('lowerPivot', at.lowerPivot),
      fixed('upperPivot', at.upperPivot),
      fixed(SHOCK_FRAME_EYE, at.shockFrameEye),
      free('lowerLinkPin', at.lowerLinkPin),
      free('upperLinkPin', at.upperLinkPin),
      free(SHOCK_EYE, at.shockEye),
    ],
    bodies: [
      { id: 'lowerLink', joints: ['lowerPivot', 'lowerLinkPin'] },
      { id: 'upperLink', joints: ['upperPivot', 'upperLinkPin', SHOCK_EYE] },
      { id: 'rearTriangle', joints: ['lowerLinkPin', 'upperLinkPin'] },
    ],
    points: axleOn('rearTriangle', at.axle),
    driver: SHOCK_DRIVER,
  };
}

/** The moving bodies of the Watt and Stephenson six-bars, in the order the panels list them. */
export const SIX_BAR_BODIES = ['chainStay', 'seatStay', 'rocker', 'link', 'bellCrank'] as const;
export type SixBarBody = (typeof SIX_BAR_BODIES)[number];
/** The bodies a six-bar's shock may end on: a moving body, or the front frame (the ground body). */
export const SHOCK_END_BODIES = [...SIX_BAR_BODIES, 'frontFrame'] as const;
export type ShockEndBody = (typeof SHOCK_END_BODIES)[number];

/**
 * Which bodies a six-bar's shock joins: its eye `shockEye` on `eye`, its other eye
 * `shockFrameEye` on `frameEye` (the front frame, or another moving body). The default
 * is the bell crank to the front frame.
 */
export interface ShockBodies {
  readonly eye: SixBarBody;
  readonly frameEye: ShockEndBody;
}
export const DEFAULT_SHOCK_BODIES: ShockBodies = { eye: 'bellCrank', frameEye: 'frontFrame' };

/** Why a six-bar's shock cannot join these bodies, or null when it can. */
export function shockBodiesIssue(shock: ShockBodies): string | null {
  if (shock.eye === shock.frameEye) return `the shock's two eyes are both on the ${shock.eye}; its length could not change, so it cannot drive the layout — put its eyes on two different bodies`;
  return null;
}

/** A six-bar's joints and bodies with the shock's eyes placed on the chosen bodies. */
function sixBarLinkage(
  fixedPivots: readonly ReturnType<typeof fixed>[],
  freeJoints: readonly ReturnType<typeof free>[],
  bodies: readonly { id: SixBarBody; joints: readonly string[] }[],
  at: { readonly shockEye: Vec2; readonly shockFrameEye: Vec2; readonly axle: Vec2; readonly axleBody: SixBarBody },
  shock: ShockBodies,
): Linkage {
  const onFrame = shock.frameEye === 'frontFrame';
  return {
    joints: [
      ...fixedPivots,
      ...(onFrame ? [fixed(SHOCK_FRAME_EYE, at.shockFrameEye)] : []),
      ...freeJoints,
      free(SHOCK_EYE, at.shockEye),
      ...(onFrame ? [] : [free(SHOCK_FRAME_EYE, at.shockFrameEye)]),
    ],
    bodies: bodies.map((b) => ({
      id: b.id,
      joints: [...b.joints, ...(b.id === shock.eye ? [SHOCK_EYE] : []), ...(b.id === shock.frameEye ? [SHOCK_FRAME_EYE] : [])],
    })),
    points: axleOn(at.axleBody, at.axle),
    driver: SHOCK_DRIVER,
  };
}

/**
 * Watt six-bar: the four-bar of chain stay, seat stay and rocker, whose rocker (a
 * ternary link, joined to the ternary front frame at `rockerPivot`) drives a bell crank
 * through a link. The axle rides on the body `axleBody` names; the shock joins the
 * bodies `shock` names (by default the bell crank and the front frame).
 */
export interface WattSixBarPositions {
  readonly mainPivot: Vec2;
  readonly stayPivot: Vec2;
  readonly rockerPivot: Vec2;
  readonly rockerStayPin: Vec2;
  readonly rockerLinkPin: Vec2;
  readonly bellCrankPivot: Vec2;
  readonly bellCrankLinkPin: Vec2;
  readonly shockEye: Vec2;
  readonly shockFrameEye: Vec2;
  readonly axle: Vec2;
  readonly axleBody: SixBarBody;
  readonly shock?: ShockBodies;
}

/**
 * Bodies: `chainStay` [mainPivot, stayPivot], `seatStay` [stayPivot, rockerStayPin],
 * `rocker` [rockerPivot, rockerStayPin, rockerLinkPin], `link` [rockerLinkPin,
 * bellCrankLinkPin], `bellCrank` [bellCrankPivot, bellCrankLinkPin], each with the
 * shock's eyes it carries.
 */
export function wattSixBar(at: WattSixBarPositions): Linkage {
  return sixBarLinkage(
    [fixed('mainPivot', at.mainPivot), fixed('rockerPivot', at.rockerPivot), fixed('bellCrankPivot', at.bellCrankPivot)],
    [free('stayPivot', at.stayPivot), free('rockerStayPin', at.rockerStayPin), free('rockerLinkPin', at.rockerLinkPin), free('bellCrankLinkPin', at.bellCrankLinkPin)],
    [
      { id: 'chainStay', joints: ['mainPivot', 'stayPivot'] },
      { id: 'seatStay', joints: ['stayPivot', 'rockerStayPin'] },
      { id: 'rocker', joints: ['rockerPivot', 'rockerStayPin', 'rockerLinkPin'] },
      { id: 'link', joints: ['rockerLinkPin', 'bellCrankLinkPin'] },
      { id: 'bellCrank', joints: ['bellCrankPivot', 'bellCrankLinkPin'] },
    ],
    at,
    at.shock ?? DEFAULT_SHOCK_BODIES,
  );
}

/**
 * Stephenson six-bar: the four-bar of chain stay, seat stay and rocker, whose seat stay
 * (a ternary link, not joined to the ternary front frame) drives a bell crank through a
 * link. The seat stay's three joints close two loops at once, so the compiler solves
 * them as one Newton block. Axle and shock bodies as for the Watt six-bar.
 */
export interface StephensonSixBarPositions {
  readonly mainPivot: Vec2;
  readonly stayPivot: Vec2;
  readonly rockerPivot: Vec2;
  readonly rockerStayPin: Vec2;
  readonly stayLinkPin: Vec2;
  readonly bellCrankPivot: Vec2;
  readonly bellCrankLinkPin: Vec2;
  readonly shockEye: Vec2;
  readonly shockFrameEye: Vec2;
  readonly axle: Vec2;
  readonly axleBody: SixBarBody;
  readonly shock?: ShockBodies;
}

/**
 * Bodies: `chainStay` [mainPivot, stayPivot], `seatStay` [stayPivot, rockerStayPin,
 * stayLinkPin], `rocker` [rockerPivot, rockerStayPin], `link` [stayLinkPin,
 * bellCrankLinkPin], `bellCrank` [bellCrankPivot, bellCrankLinkPin], each with the
 * shock's eyes it carries.
 */
export function stephensonSixBar(at: StephensonSixBarPositions): Linkage {
  return sixBarLinkage(
    [fixed('mainPivot', at.mainPivot), fixed('rockerPivot', at.rockerPivot), fixed('bellCrankPivot', at.bellCrankPivot)],
    [free('stayPivot', at.stayPivot), free('rockerStayPin', at.rockerStayPin), free('stayLinkPin', at.stayLinkPin), free('bellCrankLinkPin', at.bellCrankLinkPin)],
    [
      { id: 'chainStay', joints: ['mainPivot', 'stayPivot'] },
      { id: 'seatStay', joints: ['stayPivot', 'rockerStayPin', 'stayLinkPin'] },
      { id: 'rocker', joints: ['rockerPivot', 'rockerStayPin'] },
      { id: 'link', joints: ['stayLinkPin', 'bellCrankLinkPin'] },
      { id: 'bellCrank', joints: ['bellCrankPivot', 'bellCrankLinkPin'] },
    ],
    at,
    at.shock ?? DEFAULT_SHOCK_BODIES,
  );
}
