/** Search settings: defaults, limits, and pure updates. */
import type { FamilyId } from './families';
import type { KeepOutRegion, Measure, Placement, SearchSettings } from './project';

export const MIN_EVALUATIONS = 100;
export const MAX_EVALUATIONS = 1_000_000_000;
export const MIN_SECONDS = 1;
/** A week: longer than anyone leaves a tab open, short enough to keep the numbers sane. */
export const MAX_SECONDS = 7 * 24 * 3600;
export const MAX_WORKERS = 64;
export const MAX_SEED = 2 ** 31 - 1;

export const DEFAULT_SETTINGS: SearchSettings = {
  families: ['fourbar'],
  placement: 'free',
  measure: 'rms',
  bounds: {},
  constraints: { fullTurnCrank: true, minTransmissionDeg: null, linkLengthMm: null, keepOut: [] },
  budget: { mode: 'evaluations', evaluations: 20_000, seconds: 60 },
  seed: 1,
  workers: null,
};

/** The workers a run uses: the setting, or the machine's cores less one for the page, at least 1. */
export function workerCount(settings: SearchSettings, hardwareConcurrency: number | undefined): number {
  if (settings.workers !== null) return settings.workers;
  return Math.max(1, Math.min(MAX_WORKERS, (hardwareConcurrency ?? 2) - 1));
}

export function toggleFamily(settings: SearchSettings, family: FamilyId, on: boolean): SearchSettings {
  const has = settings.families.includes(family);
  if (on === has) return settings;
  return { ...settings, families: on ? [...settings.families, family] : settings.families.filter((f) => f !== family) };
}

export function setPlacement(settings: SearchSettings, placement: Placement): SearchSettings {
  return { ...settings, placement };
}

export function setMeasure(settings: SearchSettings, measure: Measure): SearchSettings {
  return { ...settings, measure };
}

export function setBound(settings: SearchSettings, family: FamilyId, variable: string, range: readonly [number, number] | null): SearchSettings {
  const current = { ...(settings.bounds[family] ?? {}) };
  if (range === null) delete current[variable];
  else current[variable] = [Math.min(range[0], range[1]), Math.max(range[0], range[1])];
  const bounds = { ...settings.bounds, [family]: current };
  if (Object.keys(current).length === 0) delete bounds[family];
  return { ...settings, bounds };
}

export function setFullTurnCrank(settings: SearchSettings, on: boolean): SearchSettings {
  return { ...settings, constraints: { ...settings.constraints, fullTurnCrank: on } };
}

export function setMinTransmission(settings: SearchSettings, deg: number | null): SearchSettings {
  const value = deg === null || !Number.isFinite(deg) ? null : Math.max(0, Math.min(90, deg));
  return { ...settings, constraints: { ...settings.constraints, minTransmissionDeg: value } };
}

export function setLinkLengths(settings: SearchSettings, range: readonly [number, number] | null): SearchSettings {
  const value = range === null ? null : ([Math.min(range[0], range[1]), Math.max(range[0], range[1])] as const);
  return { ...settings, constraints: { ...settings.constraints, linkLengthMm: value } };
}

export function addKeepOut(settings: SearchSettings, region: KeepOutRegion): SearchSettings {
  if (!(region.r > 0)) return settings;
  const r = { x: Math.round(region.x * 10) / 10, y: Math.round(region.y * 10) / 10, r: Math.round(region.r * 10) / 10 };
  return { ...settings, constraints: { ...settings.constraints, keepOut: [...settings.constraints.keepOut, r] } };
}

export function removeKeepOut(settings: SearchSettings, index: number): SearchSettings {
  return { ...settings, constraints: { ...settings.constraints, keepOut: settings.constraints.keepOut.filter((_, i) => i !== index) } };
}

function clampInt(value: number, min: number, max: number): number {
  return Math.max(min, Math.min(max, Math.round(value)));
}

export function setBudget(settings: SearchSettings, patch: Partial<SearchSettings['budget']>): SearchSettings {
  const next = { ...settings.budget, ...patch };
  return {
    ...settings,
    budget: {
      mode: next.mode,
      evaluations: Number.isFinite(next.evaluations) ? clampInt(next.evaluations, MIN_EVALUATIONS, MAX_EVALUATIONS) : settings.budget.evaluations,
      seconds: Number.isFinite(next.seconds) ? clampInt(next.seconds, MIN_SECONDS, MAX_SECONDS) : settings.budget.seconds,
    },
  };
}

export function setSeed(settings: SearchSettings, seed: number): SearchSettings {
  if (!Number.isFinite(seed)) return settings;
  return { ...settings, seed: clampInt(seed, 0, MAX_SEED) };
}

export function setWorkers(settings: SearchSettings, workers: number | null): SearchSettings {
  if (workers !== null && !Number.isFinite(workers)) return settings;
  return { ...settings, workers: workers === null ? null : clampInt(workers, 1, MAX_WORKERS) };
}

/** What is wrong with the settings for a search, or null. */
export function settingsProblem(settings: SearchSettings): string | null {
  if (settings.families.length === 0) return 'no mechanism family is chosen; tick at least one';
  const links = settings.constraints.linkLengthMm;
  if (links !== null && !(links[0] >= 0 && links[1] > links[0])) return `the link length limits are ${links[0]}–${links[1]} mm; expected 0 ≤ shortest < longest`;
  return null;
}
