/**
 * Search settings: defaults and pure updates. An update stores the value it is given or,
 * when the value is one the fields refuse (src/app/state/fields.ts), keeps the settings
 * as they were: nothing is clamped, rounded or swapped here.
 */
import { TRANSMISSION_GUIDELINE_DEG } from '../../core/linkage/report';
import { DEFAULT_RESULTS_PER_FAMILY } from '../../engine/runSpec';
import type { FamilyId } from './families';
import {
  checkBounds,
  checkCheckpointEvery,
  checkEvaluations,
  checkGuideline,
  checkKeepOut,
  checkLinkLengths,
  checkMaxSizeSpans,
  checkMinTransmission,
  checkResultsPerFamily,
  checkSeconds,
  checkSeed,
  checkTermWeight,
} from './fields';
import type { KeepOutRegion, Measure, Placement, SearchSettings } from './project';

export const MAX_WORKERS = 64;
/**
 * The default size limit, in target spans: five times the target's larger side. The
 * default variable boxes reach about 13 spans; a linkage a few times its path's size is
 * what a machine has room for, and five spans leaves the search room to fit.
 */
export const DEFAULT_MAX_SIZE_SPANS = 5;
/**
 * Seconds between a path search's checkpoints by default: a long run's checkpoint takes
 * about a second to save, so ten keeps saving to a tenth of the time at most.
 */
export const DEFAULT_CHECKPOINT_EVERY_S = 10;
/** The transmission guideline's low end, degrees: 40°, so 40° to 140° (common practice). */
export const DEFAULT_GUIDELINE_DEG = TRANSMISSION_GUIDELINE_DEG.min;

export const DEFAULT_SETTINGS: SearchSettings = {
  families: ['fourbar'],
  placement: 'free',
  measure: 'rms',
  bounds: {},
  constraints: { fullTurnCrank: true, minTransmissionDeg: null, linkLengthMm: null, keepOut: [], maxSizeSpans: DEFAULT_MAX_SIZE_SPANS },
  terms: { sizeWeight: 0, transmissionWeight: 1, transmissionGuidelineDeg: DEFAULT_GUIDELINE_DEG },
  resultsPerFamily: DEFAULT_RESULTS_PER_FAMILY,
  budget: { mode: 'evaluations', evaluations: 20_000, seconds: 60 },
  seed: 1,
  workers: null,
  checkpointEverySeconds: DEFAULT_CHECKPOINT_EVERY_S,
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
  if (range !== null && !checkBounds(variable, '', String(range[0]), String(range[1])).ok) return settings;
  const current = { ...(settings.bounds[family] ?? {}) };
  if (range === null) delete current[variable];
  else current[variable] = [range[0], range[1]];
  const bounds = { ...settings.bounds, [family]: current };
  if (Object.keys(current).length === 0) delete bounds[family];
  return { ...settings, bounds };
}

export function setFullTurnCrank(settings: SearchSettings, on: boolean): SearchSettings {
  return { ...settings, constraints: { ...settings.constraints, fullTurnCrank: on } };
}

export function setMinTransmission(settings: SearchSettings, deg: number | null): SearchSettings {
  if (!checkMinTransmission(deg === null ? '' : String(deg)).ok) return settings;
  return { ...settings, constraints: { ...settings.constraints, minTransmissionDeg: deg } };
}

export function setLinkLengths(settings: SearchSettings, range: readonly [number, number] | null): SearchSettings {
  if (!checkLinkLengths(range === null ? '' : String(range[0]), range === null ? '' : String(range[1])).ok) return settings;
  return { ...settings, constraints: { ...settings.constraints, linkLengthMm: range === null ? null : [range[0], range[1]] } };
}

export function setMaxSizeSpans(settings: SearchSettings, spans: number | null): SearchSettings {
  if (!checkMaxSizeSpans(spans === null ? '' : String(spans)).ok) return settings;
  return { ...settings, constraints: { ...settings.constraints, maxSizeSpans: spans } };
}

export function setTerms(settings: SearchSettings, patch: Partial<SearchSettings['terms']>): SearchSettings {
  if (patch.sizeWeight !== undefined && !checkTermWeight('Size weight', String(patch.sizeWeight)).ok) return settings;
  if (patch.transmissionWeight !== undefined && !checkTermWeight('Transmission weight', String(patch.transmissionWeight)).ok) return settings;
  if (patch.transmissionGuidelineDeg !== undefined && !checkGuideline(String(patch.transmissionGuidelineDeg)).ok) return settings;
  return { ...settings, terms: { ...settings.terms, ...patch } };
}

export function setResultsPerFamily(settings: SearchSettings, count: number): SearchSettings {
  if (!checkResultsPerFamily(String(count)).ok) return settings;
  return { ...settings, resultsPerFamily: count };
}

/** A circle dragged out on the drawing is kept to 0.1 mm: the mouse gives no finer size the user meant. */
const DRAWN_KEEP_OUT_STEP_MM = 0.1;

export function addDrawnKeepOut(settings: SearchSettings, region: KeepOutRegion): SearchSettings {
  const round = (v: number) => Math.round(v / DRAWN_KEEP_OUT_STEP_MM) / Math.round(1 / DRAWN_KEEP_OUT_STEP_MM);
  return addKeepOut(settings, { x: round(region.x), y: round(region.y), r: round(region.r) });
}

/** A circle as typed: kept exactly. */
export function addKeepOut(settings: SearchSettings, region: KeepOutRegion): SearchSettings {
  if (!checkKeepOut(String(region.x), String(region.y), String(region.r)).ok) return settings;
  return { ...settings, constraints: { ...settings.constraints, keepOut: [...settings.constraints.keepOut, { x: region.x, y: region.y, r: region.r }] } };
}

export function removeKeepOut(settings: SearchSettings, index: number): SearchSettings {
  return { ...settings, constraints: { ...settings.constraints, keepOut: settings.constraints.keepOut.filter((_, i) => i !== index) } };
}

/** The bounds and keep-out regions: what belongs to one target's frame rather than to the search. */
export function targetBound(settings: SearchSettings): { readonly bounds: SearchSettings['bounds']; readonly keepOut: SearchSettings['constraints']['keepOut'] } {
  return { bounds: settings.bounds, keepOut: settings.constraints.keepOut };
}

export function setTargetBound(settings: SearchSettings, kept: ReturnType<typeof targetBound>): SearchSettings {
  return { ...settings, bounds: kept.bounds, constraints: { ...settings.constraints, keepOut: kept.keepOut } };
}

export function setBudget(settings: SearchSettings, patch: Partial<SearchSettings['budget']>): SearchSettings {
  if (patch.evaluations !== undefined && !checkEvaluations(String(patch.evaluations), 1).ok) return settings;
  if (patch.seconds !== undefined && !checkSeconds(String(patch.seconds)).ok) return settings;
  return { ...settings, budget: { ...settings.budget, ...patch } };
}

export function setSeed(settings: SearchSettings, seed: number): SearchSettings {
  if (!checkSeed(String(seed)).ok) return settings;
  return { ...settings, seed };
}

export function setWorkers(settings: SearchSettings, workers: number | null): SearchSettings {
  if (workers !== null && !(Number.isInteger(workers) && workers >= 1 && workers <= MAX_WORKERS)) return settings;
  return { ...settings, workers };
}

export function setCheckpointEvery(settings: SearchSettings, seconds: number): SearchSettings {
  if (!checkCheckpointEvery(String(seconds)).ok) return settings;
  return { ...settings, checkpointEverySeconds: seconds };
}

/** What is wrong with the settings for a search, or null. */
export function settingsProblem(settings: SearchSettings): string | null {
  if (settings.families.length === 0) return 'Mechanism families: none is ticked; tick at least one.';
  return null;
}
