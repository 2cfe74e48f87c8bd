/**
 * Rear-suspension layouts as linkages. Each builder takes pivot positions (mm, bicycle
 * frame: origin at the bottom bracket, x forward, y up) drawn at full extension and
 * returns a Linkage whose ground body is the front frame, driven by the shock's eye-to-eye
 * length (joint `shockEye` on the suspension to ground joint `shockFrameEye`), with the
 * rear axle as the point `axle` on the axle-carrying body.
 *
 * Generic names only: single pivot, linkage-driven single pivot, four-bar with the axle
 * on the seat stay, short-link four-bar, Watt six-bar, Stephenson six-bar.
 */
import type { Vec2 } from '../geometry';
import { GROUND, type Linkage } from '../linkage';


/** The id of the rear-axle point every layout carries. */
export const AXLE_POINT = 'axle';
/** Joint ids of the shock's eyes: on the suspension, and on the front frame. */
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

/**
 * Watt six-bar: the four-bar of chain stay, seat stay and rocker, whose rocker (a
 * ternary link, joined to the ternary front frame at `rockerPivot`) drives a bell crank
 * through a link; the shock runs from the bell crank to the front frame. The axle rides
 * on the body `axleBody` names.
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
  readonly axleBody: 'chainStay' | 'seatStay';
}

/**
 * Bodies: `chainStay` [mainPivot, stayPivot], `seatStay` [stayPivot, rockerStayPin],
 * `rocker` [rockerPivot, rockerStayPin, rockerLinkPin], `link` [rockerLinkPin,
 * bellCrankLinkPin], `bellCrank` [bellCrankPivot, bellCrankLinkPin, shockEye].
 */
export function wattSixBar(at: WattSixBarPositions): Linkage {
  return {
    joints: [
      fixed('mainPivot', at.mainPivot),
      fixed('rockerPivot', at.rockerPivot),
      fixed('bellCrankPivot', at.bellCrankPivot),
      fixed(SHOCK_FRAME_EYE, at.shockFrameEye),
      free('stayPivot', at.stayPivot),
      free('rockerStayPin', at.rockerStayPin),
      free('rockerLinkPin', at.rockerLinkPin),
      free('bellCrankLinkPin', at.bellCrankLinkPin),
      free(SHOCK_EYE, at.shockEye),
    ],
    bodies: [
      { id: 'chainStay', joints: ['mainPivot', 'stayPivot'] },
      { id: 'seatStay', joints: ['stayPivot', 'rockerStayPin'] },
      { id: 'rocker', joints: ['rockerPivot', 'rockerStayPin', 'rockerLinkPin'] },
      { id: 'link', joints: ['rockerLinkPin', 'bellCrankLinkPin'] },
      { id: 'bellCrank', joints: ['bellCrankPivot', 'bellCrankLinkPin', SHOCK_EYE] },
    ],
    points: axleOn(at.axleBody, at.axle),
    driver: SHOCK_DRIVER,
  };
}

/**
 * Stephenson six-bar: the four-bar of chain stay, seat stay and rocker, whose seat stay
 * (a ternary link, not joined to the ternary front frame) drives a bell crank through a
 * link; the shock runs from the bell crank to the front frame. The seat stay's three
 * joints close two loops at once, so the compiler solves them as one Newton block.
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
  readonly axleBody: 'chainStay' | 'seatStay';
}

/**
 * Bodies: `chainStay` [mainPivot, stayPivot], `seatStay` [stayPivot, rockerStayPin,
 * stayLinkPin], `rocker` [rockerPivot, rockerStayPin], `link` [stayLinkPin,
 * bellCrankLinkPin], `bellCrank` [bellCrankPivot, bellCrankLinkPin, shockEye].
 */
export function stephensonSixBar(at: StephensonSixBarPositions): Linkage {
  return {
    joints: [
      fixed('mainPivot', at.mainPivot),
      fixed('rockerPivot', at.rockerPivot),
      fixed('bellCrankPivot', at.bellCrankPivot),
      fixed(SHOCK_FRAME_EYE, at.shockFrameEye),
      free('stayPivot', at.stayPivot),
      free('rockerStayPin', at.rockerStayPin),
      free('stayLinkPin', at.stayLinkPin),
      free('bellCrankLinkPin', at.bellCrankLinkPin),
      free(SHOCK_EYE, at.shockEye),
    ],
    bodies: [
      { id: 'chainStay', joints: ['mainPivot', 'stayPivot'] },
      { id: 'seatStay', joints: ['stayPivot', 'rockerStayPin', 'stayLinkPin'] },
      { id: 'rocker', joints: ['rockerPivot', 'rockerStayPin'] },
      { id: 'link', joints: ['stayLinkPin', 'bellCrankLinkPin'] },
      { id: 'bellCrank', joints: ['bellCrankPivot', 'bellCrankLinkPin', SHOCK_EYE] },
    ],
    points: axleOn(at.axleBody, at.axle),
    driver: SHOCK_DRIVER,
  };
}
