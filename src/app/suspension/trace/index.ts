/**
 * Tracing the bicycle over a side-view image: the image layer under the side view, its
 * controls (load, calibrate in bicycle mm, opacity, hide) and the pick buttons the panels
 * show beside the rear axle, the front contact and each pivot.
 */
export { TraceLayer } from './TraceLayer';
export { TraceControls } from './TraceControls';
export { PickButton } from './PickButton';
