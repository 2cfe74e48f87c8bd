/** Linkage analysis: mobility, Grashof and Barker classes, four-bar loops, transmission angle, instant centres. */
export { mobility } from './mobility';
export type { MobilityCount } from './mobility';
export { CHANGE_POINT_REL_TOL, classifyFourBar } from './grashof';
export type { BarkerType, FourBarClass, GrashofCondition } from './grashof';
export { fourBarLoops } from './loops';
export type { FourBarLoop } from './loops';
export { transmissionAngleRad, transmissionAngleRange } from './transmission';
export type { TransmissionRange } from './transmission';
export {
  IC_FINITE,
  IC_INDETERMINATE,
  IC_INFINITE,
  IC_SCRATCH_LENGTH,
  IC_UNASSEMBLED,
  INFINITE_CENTRE_REL_TOL,
  STILL_MOTION_REL_TOL,
  bodyMotion,
  instantCentre,
  instantCentreInto,
  instantCentrePath,
  instantCentrePathInto,
  instantCentres,
} from './instantCentres';
export type { BodyMotion, BodyRef, InstantCentre, InstantCentreEntry, InstantCentrePath } from './instantCentres';
