/** Named tolerances of the kinematics core, each with its unit and why it has its size. */

/**
 * Two joints of one body closer than this (mm) make a link of zero length: its
 * direction, and so the body's pose, is undefined. 1e-6 mm is far below any drawing
 * precision and far above rounding of mm coordinates.
 */
export const COINCIDENT_JOINT_TOL_MM = 1e-6;

/** A slider joint further than this (mm) from its line in the reference pose is off it. */
export const SLIDER_ON_LINE_TOL_MM = 1e-6;

/**
 * Newton–Raphson stops when every block equation is below this share of the plan's
 * length scale (mm per mm). Convergence is quadratic, so the step that brings the
 * residual from ~1e-7 lands near rounding (~1e-16 of the coordinates); 1e-13 is a few
 * hundred rounding errors.
 */
export const NEWTON_RESIDUAL_REL_TOL = 1e-13;

/**
 * When no step lowers the residual any more but it is already below this multiple of
 * the Newton tolerance, the residual is at the rounding floor of an ill-conditioned
 * block: converged, not stalled.
 */
export const NEWTON_ROUNDING_FLOOR_FACTOR = 100;

/** Cap on Newton iterations per block solve; a good start converges in 3–6. */
export const NEWTON_MAX_ITERATIONS = 30;

/** Cap on step halvings per Newton iteration (the step shrinks to 2^-10 of Newton's). */
export const NEWTON_MAX_HALVINGS = 10;

/**
 * A pivot of the block Jacobian below this share of its largest entry counts as zero
 * (the block is at a singular, dead-centre pose). Entries are O(1) (unit directions and
 * body-local coordinates), so 1e-13 is a few hundred rounding errors.
 */
export const SINGULAR_PIVOT_REL_TOL = 1e-13;

/**
 * The compiler accepts a Newton block only when its Jacobian at the reference pose has
 * no pivot below this share of its largest entry: a block nearly singular in the
 * reference pose is a wrong choice of unknowns or a reference at a dead centre.
 */
export const BLOCK_RANK_REL_TOL = 1e-8;

/** Cap on the subsets of unplaced joints the compiler tries as a Newton block. */
export const BLOCK_SEARCH_MAX_SUBSETS = 200_000;

/**
 * The compiler re-solves the reference pose from its own plan and accepts the plan
 * when every slot is back within this share of the length scale (mm per mm).
 */
export const REFERENCE_REPRODUCTION_REL_TOL = 1e-9;

/**
 * A dyad is at a dead centre (toggle) when the sine of its angle at the placed joint
 * falls below this: the joint is within 1e-6 of a link length of the line through its
 * two centres, and the two branches meet.
 */
export const DEAD_CENTRE_SIN_TOL = 1e-6;

/**
 * Edge and minimum refinements in a sweep stop at this share of the sample spacing (or
 * of the largest tracking step, when that is smaller).
 */
export const SWEEP_REFINE_REL_TOL = 1e-9;

/** Cap on bisection or golden-section steps per refinement (2^-60 of a step, 0.618^60 ≈ 3e-13). */
export const SWEEP_REFINE_MAX_STEPS = 60;

/** A rotation driver's range turns fully when it spans 2π less at most this (rad). */
export const FULL_TURN_TOL_RAD = 1e-9;

/**
 * A motion closes in one turn where its pose a turn on is its first pose within this
 * share of the linkage's size (the driven link's length, or the length scale): two
 * solutions of the same closure equations that near each other are one (the solver's
 * tolerance is 1e-13 of the size); another assembly, a motion that closes only after two
 * turns, is a macroscopic distance away.
 */
export const MOTION_CLOSURE_REL_TOL = 1e-7;

/**
 * Largest driver step (rad) a sweep takes when it tracks a Newton block: a predictor
 * step of 5° keeps the start of each solve well inside its branch's basin.
 */
export const SWEEP_MAX_STEP_RAD = Math.PI / 36;

/** The same for a length driver, as a share of the plan's length scale (mm per mm). */
export const SWEEP_MAX_STEP_REL = 0.05;

/**
 * A tracked step is refused, and halved, when Newton moves a block joint further than
 * this share of the step's predicted motion (the largest |rate| × step over all joints)
 * from where the rates predicted it. Along a smooth branch the correction shrinks as
 * step², the predicted motion as step, so halving always ends in acceptance; a jump to
 * another assembly does not shrink and is never accepted.
 */
export const SWEEP_CORRECTION_MAX_SHARE = 0.25;

/**
 * Corrections below this share of the length scale (mm per mm) are always allowed: the
 * Newton tolerance and rounding, not motion.
 */
export const SWEEP_CORRECTION_FLOOR_REL = 1e-9;

/** Cap on tracked sub-steps between two samples (besides one per SWEEP_MAX_STEP of distance). */
export const SWEEP_MAX_SUBSTEPS = 400;

/**
 * Where a tracked branch ends (a fold) and the branch taken up again past it leads back
 * to within this share of the length scale (mm per mm) of the same pose, the two meet
 * there: a singular point the motion passes, not a lock. At a fold positions move as the
 * square root of the driver's distance from it, so the edge, located to
 * SWEEP_REFINE_REL_TOL of a step, leaves them some 1e-6 of the size apart.
 */
export const SWEEP_REJOIN_REL_TOL = 1e-4;
