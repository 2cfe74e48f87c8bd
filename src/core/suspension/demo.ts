/**
 * A trail bike of our own making (no real bicycle's figures), and one layout of each
 * kind drawn on it at full extension. Every layout puts the axle at the bicycle's rear
 * axle and the shock's eyes exactly its eye-to-eye length apart.
 */
import type { Vec2 } from '../geometry';
import type { Bicycle } from './bicycle';
import type {
  FourBarSeatStayAxlePositions,
  LinkageDrivenSinglePivotPositions,
  ShortLinkFourBarPositions,
  SinglePivotPositions,
  StephensonSixBarPositions,
  WattSixBarPositions,
} from './layouts';

export const DEMO_TRAIL_BIKE: Bicycle = {
  rearAxleMm: { x: -435, y: -12 },
  wheelRadiusMm: 370,
  wheelbaseMm: 1225,
  comHeightMm: 1050,
  chainringTeeth: 32,
  cogTeeth: [10, 12, 14, 16, 18, 21, 24, 28, 33, 39, 45, 51],
  chainPitchMm: 12.7,
  shock: { eyeToEyeMm: 210, strokeMm: 55 },
  sag: 0.3,
  spring: { kind: 'coil', rateNPerMm: 80 },
};

const AXLE: Vec2 = DEMO_TRAIL_BIKE.rearAxleMm;
const EYE_TO_EYE_MM = DEMO_TRAIL_BIKE.shock.eyeToEyeMm;

/** The frame eye, the shock's eye-to-eye length from `eye` in the direction `angleDeg` (CCW from +x). */
function frameEye(eye: Vec2, angleDeg: number): Vec2 {
  const a = (angleDeg * Math.PI) / 180;
  return { x: eye.x + EYE_TO_EYE_MM * Math.cos(a), y: eye.y + EYE_TO_EYE_MM * Math.sin(a) };
}

const SP_EYE: Vec2 = { x: -30, y: 260 };
const LD_EYE: Vec2 = { x: 45, y: 355 };
const FB_EYE: Vec2 = { x: -70, y: 355 };
const SL_EYE: Vec2 = { x: -35, y: 255 };
const WS_EYE: Vec2 = { x: 55, y: 165 };
const SS_EYE: Vec2 = { x: 110, y: 225 };

export const DEMO_LAYOUTS: {
  readonly singlePivot: SinglePivotPositions;
  readonly linkageDrivenSinglePivot: LinkageDrivenSinglePivotPositions;
  readonly fourBarSeatStayAxle: FourBarSeatStayAxlePositions;
  readonly shortLinkFourBar: ShortLinkFourBarPositions;
  readonly wattSixBar: WattSixBarPositions;
  readonly stephensonSixBar: StephensonSixBarPositions;
} = {
  singlePivot: { mainPivot: { x: 30, y: 80 }, axle: AXLE, shockEye: SP_EYE, shockFrameEye: frameEye(SP_EYE, -5) },
  linkageDrivenSinglePivot: {
    mainPivot: { x: 55, y: 65 },
    axle: AXLE,
    armLinkPin: { x: -65, y: 155 },
    rockerPivot: { x: 40, y: 255 },
    rockerLinkPin: { x: -25, y: 325 },
    shockEye: LD_EYE,
    shockFrameEye: frameEye(LD_EYE, -3),
  },
  fourBarSeatStayAxle: {
    mainPivot: { x: 45, y: 85 },
    stayPivot: { x: -410, y: 5 },
    rockerPivot: { x: -15, y: 325 },
    rockerStayPin: { x: -110, y: 300 },
    shockEye: FB_EYE,
    shockFrameEye: frameEye(FB_EYE, 0),
    axle: AXLE,
  },
  shortLinkFourBar: {
    lowerPivot: { x: 60, y: 35 },
    lowerLinkPin: { x: -10, y: -10 },
    upperPivot: { x: -5, y: 215 },
    upperLinkPin: { x: -60, y: 240 },
    shockEye: SL_EYE,
    shockFrameEye: frameEye(SL_EYE, 6),
    axle: AXLE,
  },
  wattSixBar: {
    mainPivot: { x: 35, y: 50 },
    stayPivot: { x: -410, y: 20 },
    rockerPivot: { x: -25, y: 305 },
    rockerStayPin: { x: -125, y: 350 },
    rockerLinkPin: { x: -10, y: 325 },
    bellCrankPivot: { x: 65, y: 225 },
    bellCrankLinkPin: { x: 40, y: 210 },
    shockEye: WS_EYE,
    shockFrameEye: frameEye(WS_EYE, 1),
    axle: AXLE,
    axleBody: 'seatStay',
  },
  stephensonSixBar: {
    mainPivot: { x: 35, y: 75 },
    stayPivot: { x: -395, y: 5 },
    rockerPivot: { x: -40, y: 290 },
    rockerStayPin: { x: -110, y: 345 },
    stayLinkPin: { x: -195, y: 275 },
    bellCrankPivot: { x: 10, y: 205 },
    bellCrankLinkPin: { x: -30, y: 295 },
    shockEye: SS_EYE,
    shockFrameEye: frameEye(SS_EYE, -77),
    axle: AXLE,
    axleBody: 'seatStay',
  },
};
