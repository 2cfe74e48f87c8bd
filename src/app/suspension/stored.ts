/**
 * The suspension workspace as the project keeps it: the bicycle's fields as typed (a
 * field still being corrected is kept too), the layout with its pivots, the pivots of
 * the kinds left, the gear shown, and the search's set-up (absent in a project kept
 * before there was one: it then opens with the demo's set-up). Plain JSON; its schema
 * checks it when read back.
 */
import { z } from 'zod';
import { LAYOUT_KINDS, LAYOUT_PIVOTS, SHOCK_END_BODIES, SIX_BAR_BODIES, type LayoutKind } from '../../core/suspension';
import type { BicycleDraft } from './fields';
import type { LayoutDraft, SuspensionState } from './state';
import { demoSearchSetup, type SearchSetup } from './targets/setup';
import { storedSearchSetupSchema } from './targets/setupSchema';
import type { RunningSearch, SearchRecord } from './search/results';
import { storedRunningSearchSchema, storedSearchRecordSchema } from './search/resultsSchema';

export interface StoredSuspension {
  readonly name: string;
  readonly draft: BicycleDraft;
  readonly layout: LayoutDraft;
  readonly pivotsByKind: SuspensionState['pivotsByKind'];
  readonly cogIndex: number;
  readonly search?: SearchSetup;
  readonly searchResults?: SearchRecord;
  /** Absent in a project kept before searches resumed after a reload. */
  readonly searchRunning?: RunningSearch;
}

const finite = z.number().refine(Number.isFinite, 'expected a finite number');
const xy = z.object({ x: finite, y: finite });
const kind = z.enum(LAYOUT_KINDS as unknown as [LayoutKind, ...LayoutKind[]]);
const pivots = z.record(z.string(), xy);
const text = z.string().max(10_000);

const draft = z.object({
  rearAxleX: text,
  rearAxleY: text,
  wheelRadius: text,
  frontMode: z.enum(['wheelbase', 'frontContact']),
  front: text,
  comHeight: text,
  chainringTeeth: text,
  cogTeeth: text,
  chainPitch: text,
  eyeToEye: text,
  stroke: text,
  sagPct: text,
  springMode: z.enum(['none', 'coil', 'air']),
  coilRate: text,
  coilPreload: text,
  airPressure: text,
  airVolume: text,
  airPistonArea: text,
  gasLaw: z.enum(['isothermal', 'adiabatic']),
});

const hasEveryPivot = (k: LayoutKind, p: Readonly<Record<string, unknown>>) => LAYOUT_PIVOTS[k].every((name) => p[name] !== undefined);

export const storedSuspensionSchema = z.object({
  name: z.string().max(200),
  draft,
  layout: z
    .object({
      kind,
      pivots,
      axleBody: z.enum(SIX_BAR_BODIES),
      // Absent in projects stored before the six-bars' shock could join two moving bodies.
      shock: z.object({ eye: z.enum(SIX_BAR_BODIES), frameEye: z.enum(SHOCK_END_BODIES) }).optional(),
      floatingBrakeBody: z.string().max(64).nullable(),
    })
    .refine((l) => hasEveryPivot(l.kind, l.pivots), 'expected every pivot of the layout kind'),
  pivotsByKind: z.partialRecord(kind, pivots),
  cogIndex: z.number().int().min(0),
  search: storedSearchSetupSchema.optional(),
  searchResults: storedSearchRecordSchema,
  searchRunning: storedRunningSearchSchema,
});

export function storedOf(state: SuspensionState): StoredSuspension {
  return { name: state.name, draft: state.draft, layout: state.layout, pivotsByKind: state.pivotsByKind, cogIndex: state.cogIndex, search: state.search, ...(state.searchResults === undefined ? {} : { searchResults: state.searchResults }), ...(state.searchRunning === undefined ? {} : { searchRunning: state.searchRunning }) };
}

/** Whether two states keep the same design (what `storedOf` takes is the same). */
export function sameDesign(a: SuspensionState, b: SuspensionState): boolean {
  return a.name === b.name && a.draft === b.draft && a.layout === b.layout && a.pivotsByKind === b.pivotsByKind && a.cogIndex === b.cogIndex && a.search === b.search && a.searchResults === b.searchResults && a.searchRunning === b.searchRunning;
}

/** The workspace a stored design opens to (at full extension, no import pending). */
export function stateOf(stored: StoredSuspension): SuspensionState {
  const kept: Partial<Record<LayoutKind, Readonly<Record<string, { x: number; y: number }>>>> = {};
  for (const [k, p] of Object.entries(stored.pivotsByKind) as [LayoutKind, Readonly<Record<string, { x: number; y: number }>>][]) {
    // A kind's pivots are kept only whole: switching back to it must find every one.
    if (hasEveryPivot(k, p)) kept[k] = p;
  }
  return {
    name: stored.name,
    draft: stored.draft,
    layout: stored.layout,
    pivotsByKind: kept,
    cogIndex: stored.cogIndex,
    travelStep: 0,
    importIssues: null,
    search: stored.search ?? demoSearchSetup(),
    setupTool: null,
    ...(stored.searchResults === undefined ? {} : { searchResults: stored.searchResults }),
    ...(stored.searchRunning === undefined ? {} : { searchRunning: stored.searchRunning }),
  };
}
