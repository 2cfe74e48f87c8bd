/** The kinematics core: model, compile, run, sweep, families and analysis. */
export * from './model';
export type { Plan, PlanBody } from './plan';
export { linkJointPairs } from './plan';
export { compile, setReferencePose } from './compile';
export type { CompileResult } from './compile';
export { closureResidualMm, run, runWithRates } from './run';
export { sweep } from './sweep';
export type { SweepRange, SweepResult } from './sweep';
export { mobility } from './analysis/mobility';
export type { MobilityCount } from './analysis/mobility';
export * from './families';
export {
  COINCIDENT_JOINT_TOL_MM,
  DEAD_CENTRE_SIN_TOL,
  NEWTON_MAX_ITERATIONS,
  NEWTON_RESIDUAL_REL_TOL,
  SLIDER_ON_LINE_TOL_MM,
} from './tolerances';
