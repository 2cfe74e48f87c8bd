/** Walking legs: the leg problem, gait figures over one crank turn, and legs phased on one shaft. */
export { GROUND_VERTICAL_REL_TOL, MAX_FOOT_PATH_POINTS, validateLeg } from './leg';
export type { GroundLineSpec, Leg, LegIssue, LegSpec, LegValidation, XyMm } from './leg';
export { DEFAULT_GAIT_STEPS, GAIT_STEPS_RANGE, gaitFigures } from './metrics';
export type { FootPath, GaitFigures, GaitOptions, GaitResult, LoopTransmission, StanceFigures, TurnRange } from './types';
export { MAX_PHASED_LEGS, PHASED_MODEL, phasedLegs } from './phased';
export type { FootCountSegment, PhasedFigures, PhasedOptions, PhasedResult } from './phased';
export { GAIT_ANGLE_TOL_RAD, GAIT_SOLVE_MAX_STEPS } from './solve';
export { GAIT_CAUTION, GAIT_CONVENTIONS } from './conventions';
export { DEMO_TOY_LEG, DEMO_TOY_LEG_LINKAGE } from './demo';
