/** Rear-suspension analysis: the bicycle, layouts as linkages, and the curves over wheel travel. */
export {
  ATMOSPHERE_KPA,
  BICYCLE_RANGES,
  DEFAULT_CHAIN_PITCH_MM,
  GAS_LAW_EXPONENT,
  validateBicycle,
} from './bicycle';
export type { Bicycle, BicycleIssue, BicycleValidation, GasLaw, SpringSpec, ValidBicycle } from './bicycle';
export { pitchRadiusMm } from './chain';
export {
  AXLE_POINT,
  FRONT_FRAME,
  SHOCK_EYE,
  SHOCK_FRAME_EYE,
  DEFAULT_SHOCK_BODIES,
  SHOCK_END_BODIES,
  SIX_BAR_BODIES,
  shockBodiesIssue,
  fourBarSeatStayAxle,
  linkageDrivenSinglePivot,
  shortLinkFourBar,
  singlePivot,
  stephensonSixBar,
  wattSixBar,
} from './layouts';
export type {
  FourBarSeatStayAxlePositions,
  LinkageDrivenSinglePivotPositions,
  ShortLinkFourBarPositions,
  ShockBodies,
  ShockEndBody,
  SinglePivotPositions,
  SixBarBody,
  StephensonSixBarPositions,
  WattSixBarPositions,
} from './layouts';
export { springForceN, springRateNPerMm, wheelRateNPerMm } from './spring';
export { LEVERAGE_SLOPE_STEP_MM } from './curves';
export type { InstantCentreCurve, SuspensionCurves } from './curves';
export {
  AXLE_MATCH_TOL_MM,
  DEFAULT_STEPS,
  STEPS_RANGE,
  SUSPENSION_CAUTION,
  SUSPENSION_CONVENTIONS,
  prepareSuspension,
  suspensionCurves,
} from './metrics';
export type { SuspensionEvaluator, SuspensionOptions, SuspensionPoint, SuspensionPreparation, SuspensionReport, SuspensionResult } from './metrics';
export { DEMO_TRAIL_BIKE, DEMO_LAYOUTS } from './demo';
export { LAYOUT_KINDS, LAYOUT_NAMES, LAYOUT_PIVOTS, buildLayout, demoAxleBody, demoPivots, hasBodyChoice } from './layoutKinds';
export type { LayoutAxleBody, LayoutKind } from './layoutKinds';
export { SIDE_VIEW_STROKE_TOL_MM, sideView, sideViewExtent } from './sideView';
export type { SideViewBox, SideViewDesign, SideViewPose, SideViewPrimitive, SideViewResult, SideViewRole } from './sideView';
