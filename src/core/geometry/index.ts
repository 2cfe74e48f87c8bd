/** Plane geometry for the kinematics kernel and the synthesis error measures. */
export { add, angleRad, cross, distance, dot, length, lerp, perp, rotate, scale, sub, vec2 } from './vec2';
export type { Vec2 } from './vec2';
export { SINCOS_REDUCTION_LIMIT, cosSinInto, polarInto } from './trig';
export {
  PARALLEL_SIN_TOL,
  circleCircleIntersect,
  circleCircleIntersectInto,
  circleLineIntersect,
  circleLineIntersectInto,
  lineLineIntersect,
} from './intersect';
export type { Branch, LineLineIntersection } from './intersect';
export { nearestOnPolyline, pointToPolylineDistance } from './polyline';
export type { PolylineNearest } from './polyline';
export {
  SIMILARITY_SPREAD_REL_TOL,
  SIM_A,
  SIM_B,
  SIM_LENGTH,
  SIM_SSE,
  SIM_TX,
  SIM_TY,
  applySimilarityInto,
  similarityFit,
  similarityFitInto,
} from './similarity';
export type { SimilarityFit } from './similarity';
