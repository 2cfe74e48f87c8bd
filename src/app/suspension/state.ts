/**
 * The suspension workspace's state and its pure update function: the bicycle's fields
 * as typed, the layout (kind, pivots at full extension, axle and shock bodies, floating brake), the
 * gear and travel shown, the last import's problems, and the search's set-up (targets,
 * regions, keep-outs, budget) with the side view's drawing tool for it.
 */
import type { Vec2 } from '../../core/geometry';
import type { SuspensionDesign, SuspensionFileIssue } from '../../core/io/suspensionFile';
import {
  DEMO_TRAIL_BIKE,
  LAYOUT_PIVOTS,
  demoAxleBody,
  demoPivots,
  type GasLaw,
  type LayoutAxleBody,
  type LayoutKind,
  type ShockBodies,
} from '../../core/suspension';
import { draftOf, switchFrontMode, type BicycleDraft, type DraftField, type FrontMode, type SpringMode } from './fields';
import { demoSearchSetup, reduceSearchSetup, type SearchSetup, type SearchSetupAction, type SetupTool } from './targets/setup';
import { recordAfter, type RunningSearch, type SearchRecord, type SearchRun } from './search/results';

export interface LayoutDraft {
  readonly kind: LayoutKind;
  /** Every pivot of the kind (LAYOUT_PIVOTS), mm, at full extension. */
  readonly pivots: Readonly<Record<string, Vec2>>;
  /** The six-bars' axle-carrying body. */
  readonly axleBody: LayoutAxleBody;
  /** The six-bars' shock bodies; absent (as in projects stored before the choice) means the bell crank to the front frame. */
  readonly shock?: ShockBodies;
  /** A moving body holding a floating brake's caliper, or null. */
  readonly floatingBrakeBody: string | null;
}

export interface SuspensionState {
  readonly name: string;
  readonly draft: BicycleDraft;
  readonly layout: LayoutDraft;
  /** Pivots of the kinds left, so switching back loses nothing. */
  readonly pivotsByKind: Readonly<Partial<Record<LayoutKind, Readonly<Record<string, Vec2>>>>>;
  /** Index into the cassette of the gear drawn and highlighted. */
  readonly cogIndex: number;
  /** Index into the travel samples of the pose drawn. */
  readonly travelStep: number;
  /** What the last design file import found wrong, by field; null when none. */
  readonly importIssues: { readonly fileName: string; readonly issues: readonly SuspensionFileIssue[] } | null;
  /** The search's set-up as typed: kept in the project with the design. */
  readonly search: SearchSetup;
  /** What a drag on the side view draws for the set-up; null: it moves pivots. */
  readonly setupTool: SetupTool;
  /** The last search's ranked designs, and the run before it; absent until a search ends. */
  readonly searchResults?: SearchRecord;
  /** The search running now, until it ends: a reload resumes it from its checkpoints. */
  readonly searchRunning?: RunningSearch;
}

export type SuspensionAction =
  | { readonly type: 'name'; readonly name: string }
  | { readonly type: 'field'; readonly field: DraftField; readonly text: string }
  | { readonly type: 'frontMode'; readonly mode: FrontMode }
  | { readonly type: 'springMode'; readonly mode: SpringMode }
  | { readonly type: 'gasLaw'; readonly law: GasLaw }
  | { readonly type: 'layoutKind'; readonly kind: LayoutKind }
  | { readonly type: 'pivot'; readonly name: string; readonly at: Vec2 }
  | { readonly type: 'axleBody'; readonly body: LayoutAxleBody }
  | { readonly type: 'shockBodies'; readonly shock: ShockBodies }
  | { readonly type: 'floatingBrake'; readonly body: string | null }
  | { readonly type: 'cog'; readonly index: number }
  | { readonly type: 'travelStep'; readonly step: number }
  | { readonly type: 'load'; readonly design: SuspensionDesign; readonly fallbackName: string }
  | { readonly type: 'importIssues'; readonly fileName: string; readonly issues: readonly SuspensionFileIssue[] }
  | { readonly type: 'dismissImport' }
  | { readonly type: 'search'; readonly action: SearchSetupAction }
  | { readonly type: 'setupTool'; readonly tool: SetupTool }
  | { readonly type: 'searchStarted'; readonly running: RunningSearch }
  | { readonly type: 'searchFinished'; readonly run: SearchRun }
  | { readonly type: 'searchEnded' }
  | { readonly type: 'openLayout'; readonly kind: LayoutKind; readonly pivots: Readonly<Record<string, Vec2>>; readonly axleBody: LayoutAxleBody; readonly shock: ShockBodies };

/** The kind the demo opens with: the four-bar with the axle on the seat stay. */
export const DEMO_LAYOUT_KIND: LayoutKind = 'fourBarSeatStayAxle';
export const DEMO_DESIGN_NAME = 'Rear suspension demo (trail bike, four-bar)';

function layoutOf(kind: LayoutKind, pivots: Readonly<Record<string, Vec2>>, axleBody: LayoutAxleBody, floatingBrakeBody: string | null): LayoutDraft {
  return { kind, pivots, axleBody, floatingBrakeBody };
}

/** The demo: our own trail bike with the demo four-bar (no real bicycle's figures). */
export function demoSuspensionState(): SuspensionState {
  const cogs = DEMO_TRAIL_BIKE.cogTeeth;
  return {
    name: DEMO_DESIGN_NAME,
    draft: draftOf(DEMO_TRAIL_BIKE),
    layout: layoutOf(DEMO_LAYOUT_KIND, demoPivots(DEMO_LAYOUT_KIND), demoAxleBody(DEMO_LAYOUT_KIND), null),
    pivotsByKind: {},
    // A middle gear: the chain line most ridden on a climb is drawn and highlighted.
    cogIndex: Math.floor(cogs.length / 2),
    travelStep: 0,
    importIssues: null,
    search: demoSearchSetup(),
    setupTool: null,
  };
}

function withoutRunning(state: SuspensionState): SuspensionState {
  const { searchRunning: _ended, ...rest } = state;
  return rest;
}

export function reduceSuspension(state: SuspensionState, action: SuspensionAction): SuspensionState {
  switch (action.type) {
    case 'name':
      return { ...state, name: action.name };
    case 'field':
      return state.draft[action.field] === action.text ? state : { ...state, draft: { ...state.draft, [action.field]: action.text } };
    case 'frontMode':
      return { ...state, draft: switchFrontMode(state.draft, action.mode) };
    case 'springMode':
      return { ...state, draft: { ...state.draft, springMode: action.mode } };
    case 'gasLaw':
      return { ...state, draft: { ...state.draft, gasLaw: action.law } };
    case 'layoutKind': {
      if (action.kind === state.layout.kind) return state;
      const kept = { ...state.pivotsByKind, [state.layout.kind]: state.layout.pivots };
      const pivots = kept[action.kind] ?? demoPivots(action.kind);
      // A region being drawn belongs to the layout left: the tool ends with it.
      const setupTool = state.setupTool?.kind === 'region' ? null : state.setupTool;
      return { ...state, pivotsByKind: kept, layout: layoutOf(action.kind, pivots, demoAxleBody(action.kind), null), travelStep: 0, setupTool };
    }
    case 'pivot': {
      if (!LAYOUT_PIVOTS[state.layout.kind].includes(action.name)) return state;
      return { ...state, layout: { ...state.layout, pivots: { ...state.layout.pivots, [action.name]: { x: action.at.x, y: action.at.y } } } };
    }
    case 'axleBody':
      return { ...state, layout: { ...state.layout, axleBody: action.body } };
    case 'shockBodies':
      return { ...state, layout: { ...state.layout, shock: action.shock } };
    case 'floatingBrake':
      return { ...state, layout: { ...state.layout, floatingBrakeBody: action.body } };
    case 'cog':
      return { ...state, cogIndex: action.index };
    case 'travelStep':
      return { ...state, travelStep: action.step };
    case 'load': {
      const { design } = action;
      const l = design.layout;
      return {
        name: design.name ?? action.fallbackName,
        draft: draftOf(design.bicycle),
        layout: { ...layoutOf(l.kind, l.pivots, l.axleBody ?? demoAxleBody(l.kind), l.floatingBrakeBody ?? null), ...(l.shock === undefined ? {} : { shock: l.shock }) },
        pivotsByKind: {},
        cogIndex: 0,
        travelStep: 0,
        importIssues: null,
        // A design file carries no search set-up: the one being written is kept.
        search: state.search,
        setupTool: null,
        ...(state.searchResults === undefined ? {} : { searchResults: state.searchResults }),
        ...(state.searchRunning === undefined ? {} : { searchRunning: state.searchRunning }),
      };
    }
    case 'importIssues':
      return { ...state, importIssues: { fileName: action.fileName, issues: action.issues } };
    case 'dismissImport':
      return { ...state, importIssues: null };
    case 'search': {
      const search = reduceSearchSetup(state.search, action.action);
      return search === state.search ? state : { ...state, search };
    }
    case 'setupTool':
      return { ...state, setupTool: action.tool };
    case 'searchStarted':
      return { ...state, searchRunning: action.running };
    case 'searchFinished':
      return { ...withoutRunning(state), searchResults: recordAfter(state.searchResults, action.run) };
    case 'searchEnded':
      return state.searchRunning === undefined ? state : withoutRunning(state);
    case 'openLayout': {
      // A searched design opened in the workspace; the pivots of the kind it replaces are kept, as on a switch of kind.
      const kept = action.kind === state.layout.kind ? state.pivotsByKind : { ...state.pivotsByKind, [state.layout.kind]: state.layout.pivots };
      return { ...state, pivotsByKind: kept, layout: { ...layoutOf(action.kind, action.pivots, action.axleBody, null), shock: action.shock }, travelStep: 0 };
    }
  }
}
