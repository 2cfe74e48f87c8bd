/** What the gait figures are and are not, in the words shown beside them. */

/** User-facing caution for walking machines. */
export const GAIT_CAUTION =
  'Loci computes kinematics only, not strength, stiffness, fatigue, stability or the forces of walking. A walking machine ' +
  'that carries people or loads must be checked by a qualified engineer, physically tested, and meet the applicable ' +
  'standards for machinery before anyone rides on it, works beside it or loads it.';

/** How each figure is defined, to show beside it. */
export const GAIT_CONVENTIONS: readonly string[] = [
  'One crank turn at constant speed, from the reference pose in the crank\'s direction; crank angles are measured from the reference pose along that direction.',
  'Rates are exact (implicit differentiation of the solved pose), at a crank speed of 1 rad/s: foot speeds are in mm per radian of crank.',
  'Height: the foot\'s distance from the ground line, positive on its up side. Along: the foot\'s position along the ground line, positive where the body walks.',
  'Stance: the crank angles where the foot is within the stance tolerance of the ground line (|height| ≤ tolerance); its ends are located to 1e-12 rad.',
  'Duty factor: the stance\'s share of the turn, always given with its tolerance. Stride: the extent along the ground of the longest stance. Step height: the greatest height over the turn.',
  'Flatness: peak-to-peak of the height over the longest stance (exact) and its RMS about the ground line, weighted by crank angle (trapezoid rule over the samples).',
  'Stance speed: the foot\'s speed backwards along the ground relative to the body (positive when the foot pushes the body forward); variation = (max − min) / mean over the longest stance.',
  'Transmission angle: the crank ranges within stance where any four-bar loop is outside the 40°–140° guideline (common practice).',
  'Leg size: the box holding every joint and point over the turn (extremes between samples located from the exact rates).',
];
