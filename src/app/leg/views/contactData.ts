/**
 * What the contact diagram draws, from the core's phasedLegs: each leg's stance as bars
 * over the shaft's turn (0–360°), the number of feet on the ground along the turn, and
 * the body height ripple. Pure, so the diagram and its tests read the same data.
 */
import { phasedLegs, type GaitFigures, type PhasedFigures } from '../../../core/gait';
import type { LegPhasing } from '../../../core/io/legFile';
import { DEG_PER_RAD, rangeOnTurnDeg, type DegRange } from './legGeometry';

const RAD_PER_DEG = Math.PI / 180;

export interface ContactRow {
  /** 1-based, as the page names it. */
  readonly leg: number;
  readonly phaseDeg: number;
  /** Stance over the shaft's turn, degrees within 0–360 (a stance through 0° is two bars). */
  readonly bars: readonly DegRange[];
}

export interface ContactData {
  readonly rows: readonly ContactRow[];
  /** The feet in stance along the shaft's turn, degrees. */
  readonly counts: readonly (DegRange & { readonly feet: number })[];
  readonly phased: PhasedFigures;
}

export type ContactResult = { readonly ok: true; readonly data: ContactData } | { readonly ok: false; readonly reason: string };

/**
 * Leg i's crank is ahead of the shaft by its phase, so its foot is in stance at shaft
 * angle s when s + phase lies in a stance interval: each interval shifted back by the phase.
 */
export function contactDiagramData(figures: GaitFigures, phasing: LegPhasing): ContactResult {
  const result = phasedLegs(figures, { legs: phasing.legs, phasesRad: phasing.phasesDeg.map((p) => p * RAD_PER_DEG) });
  if (!result.ok) return result;
  const phased = result.figures;
  const rows = phased.phasesRad.map((phase, i): ContactRow => ({
    leg: i + 1,
    phaseDeg: phasing.phasesDeg[i],
    bars: figures.stance.intervals.flatMap((r) => rangeOnTurnDeg(r.fromRad - phase, r.toRad - phase)),
  }));
  const counts = phased.feetOnGround.map((s) => ({ fromDeg: s.fromRad * DEG_PER_RAD, toDeg: s.toRad * DEG_PER_RAD, feet: s.feet }));
  return { ok: true, data: { rows, counts, phased } };
}
