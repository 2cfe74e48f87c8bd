/**
 * Shock spring force and rate against shock shortening s (mm from full extension), and
 * the wheel rate they give through a leverage ratio.
 */
import { ATMOSPHERE_KPA, GAS_LAW_EXPONENT, type SpringSpec } from './bicycle';

/** kPa to N/mm² (MPa). */
const KPA_TO_N_PER_MM2 = 1e-3;

/** Spring force (N) at shortening s (mm). An air spring: gauge pressure times piston area, p V^n constant. */
export function springForceN(spring: SpringSpec, shorteningMm: number): number {
  if (spring.kind === 'coil') return spring.rateNPerMm * (shorteningMm + (spring.preloadMm ?? 0));
  const n = GAS_LAW_EXPONENT[spring.gasLaw];
  const volume = spring.volumeMm3 - spring.pistonAreaMm2 * shorteningMm;
  const absoluteKPa = (spring.pressureKPa + ATMOSPHERE_KPA) * (spring.volumeMm3 / volume) ** n;
  return (absoluteKPa - ATMOSPHERE_KPA) * KPA_TO_N_PER_MM2 * spring.pistonAreaMm2;
}

/** Spring rate dF/ds (N/mm) at shortening s (mm): for air n p_abs A² / V. */
export function springRateNPerMm(spring: SpringSpec, shorteningMm: number): number {
  if (spring.kind === 'coil') return spring.rateNPerMm;
  const n = GAS_LAW_EXPONENT[spring.gasLaw];
  const volume = spring.volumeMm3 - spring.pistonAreaMm2 * shorteningMm;
  const absoluteKPa = (spring.pressureKPa + ATMOSPHERE_KPA) * (spring.volumeMm3 / volume) ** n;
  return (n * absoluteKPa * KPA_TO_N_PER_MM2 * spring.pistonAreaMm2 * spring.pistonAreaMm2) / volume;
}

/**
 * Wheel rate (N/mm of vertical wheel travel y). The wheel force is F_s / LR by virtual
 * work (F_w dy = F_s ds); differentiating in y, with ds/dy = 1/LR:
 * k_w = k_s / LR² − (F_s / LR²) dLR/dy = k_s / LR² − F_s (dLR/ds) / LR³.
 * The constant-ratio term is Barton and Fieldhouse, 2018 (§3.9).
 */
export function wheelRateNPerMm(springRate: number, springForce: number, leverageRatio: number, dLeverageDShortening: number): number {
  const lr2 = leverageRatio * leverageRatio;
  return springRate / lr2 - (springForce * dLeverageDShortening) / (lr2 * leverageRatio);
}
