/**
 * The chosen families' variables and default bounds on this target (from the synthesis
 * objective itself, so the editor shows exactly what the search uses), and the bounds
 * of the ground pivots as regions on the drawing. Built only when the target or the
 * settings change, never while a search runs (they are locked then).
 */
import { useMemo } from 'react';
import { createObjective, createProblem } from '../../core/synthesis';
import { problemInputOf } from '../run/runInput';
import { IDLE_RUN, PROJECT_FORMAT, PROJECT_VERSION, type Project } from '../state/project';
import { DEFAULT_SETTINGS } from '../state/settings';
import { useWorkspace } from '../state/store';
import { positionRegions, type FamilyBounds, type PositionRegion } from './boundRegions';

/** Per-point driver variables (`theta2_3`, `driver_12`) are angles the timing owns, not dimensions to bound by hand. */
const PER_POINT_VARIABLE = /_\d+$/;
/** The families name ground pivots with a trailing 0 (A0, B0, …; src/core/linkage/families.ts). */
const GROUND_PIVOT = /0\.[xy]$/;

export function defaultFamilyBounds(project: Project): FamilyBounds[] {
  const made = createProblem(problemInputOf({ ...project, settings: { ...project.settings, bounds: {} } }));
  if (!made.ok) return [];
  return made.problem.families.flatMap((family) => {
    const objective = createObjective(made.problem, family);
    const keep = objective.variableNames.map((name, k) => ({ name, k })).filter(({ name }) => !PER_POINT_VARIABLE.test(name));
    return [
      {
        family,
        variableNames: keep.map(({ name }) => name),
        lower: keep.map(({ k }) => objective.lower[k]),
        upper: keep.map(({ k }) => objective.upper[k]),
      },
    ];
  });
}

export function useFamilyBounds(): { familyBounds: FamilyBounds[]; regions: PositionRegion[] } {
  const points = useWorkspace((s) => s.project.target.points);
  const closed = useWorkspace((s) => s.project.target.closed);
  const timing = useWorkspace((s) => s.project.target.timing);
  const { families, placement, bounds, constraints } = useWorkspace((s) => s.project.settings);
  // Only what the variables and their default boxes depend on (not the image, the budget or the seed).
  const familyBounds = useMemo(() => {
    return defaultFamilyBounds({
      format: PROJECT_FORMAT,
      version: PROJECT_VERSION,
      name: '',
      target: { points, closed, timing, background: null },
      settings: { ...DEFAULT_SETTINGS, families, placement, constraints },
      run: IDLE_RUN,
      candidates: [],
      candidatesTarget: null,
    });
  }, [points, closed, timing, families, placement, constraints]);
  const regions = useMemo(() => {
    // With a free placement the search moves the whole design; its positions are not the drawing's.
    if (placement !== 'fixed') return [];
    const withOverrides = familyBounds.map((fb) => {
      const own = bounds[fb.family] ?? {};
      const ground = fb.variableNames.map((n, k) => ({ n, k })).filter(({ n }) => GROUND_PIVOT.test(n) || own[n] !== undefined);
      return {
        ...fb,
        variableNames: ground.map(({ n }) => n),
        lower: ground.map(({ n, k }) => own[n]?.[0] ?? fb.lower[k]),
        upper: ground.map(({ n, k }) => own[n]?.[1] ?? fb.upper[k]),
      };
    });
    return positionRegions(withOverrides);
  }, [familyBounds, bounds, placement]);
  return { familyBounds, regions };
}
