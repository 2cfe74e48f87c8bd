/**
 * The workspace's state and its one update function: `reduce(state, action)` is pure,
 * so every change the user or a search makes is a plain action that can be tested.
 * The project is what is saved; `ui` is what the screen is doing (not saved).
 */
import type { CandidateReport } from '../../core/synthesis';
import type { CsvIssue } from '../../core/io/pointsCsv';
import { resamplePath } from '../target/resample';
import type { FamilyId } from './families';
import { IDLE_RUN, isLocked, type BackgroundImage, type KeepOutRegion, type Measure, type Placement, type Project, type RunState, type TargetPoint, type TargetSnapshot, type TargetState, type TimingMode } from './project';
import { checkProjectName } from './fields';
import type { StoredSuspension } from '../suspension/stored';
import type { StoredLeg } from '../leg/stored';
import * as S from './settings';
import * as T from './target';

export type Tool = 'point' | 'calibrate' | 'keep-out';

export interface Notice {
  readonly kind: 'error' | 'info';
  readonly title: string;
  readonly lines: readonly string[];
}

export interface UiState {
  readonly tool: Tool;
  readonly selectedPoint: number | null;
  /** What the last import or paste said: the issues that kept the target unchanged, or what was read. */
  readonly targetNotice: Notice | null;
  /** Calibration points picked on the image so far, mm. */
  readonly calibration: readonly { readonly x: number; readonly y: number }[];
  /** Whether the project was read back from storage yet, and whether storage works. */
  readonly storage: 'loading' | 'ready' | 'unavailable';
  /** Bumped when the drawing should fit its view to the target again (a new target, "Fit view"). */
  readonly fitRequest: number;
  /** What each field that holds something it cannot take says, by field key; a search cannot start while any is here. */
  readonly fieldIssues: Readonly<Record<string, string>>;
  /** The bounds and keep-out regions of the previous target, cleared when a new one came in; they can be brought back. */
  readonly setAside: SetAside | null;
}

export interface SetAside extends ReturnType<typeof S.targetBound> {
  /** What was cleared, in words ("3 variable bounds and 1 keep-out region"). */
  readonly what: string;
}

export interface WorkspaceState {
  readonly project: Project;
  readonly ui: UiState;
}

export const INITIAL_UI: UiState = { tool: 'point', selectedPoint: null, targetNotice: null, calibration: [], storage: 'loading', fitRequest: 0, fieldIssues: {}, setAside: null };

export type Action =
  | { readonly type: 'project/load'; readonly project: Project }
  | { readonly type: 'project/rename'; readonly name: string }
  | { readonly type: 'project/suspension'; readonly suspension: StoredSuspension }
  | { readonly type: 'project/leg'; readonly leg: StoredLeg }
  | { readonly type: 'storage/status'; readonly storage: UiState['storage'] }
  | { readonly type: 'target/replace'; readonly points: readonly TargetPoint[]; readonly closed?: boolean; readonly timing?: TimingMode; readonly notice?: Notice | null }
  | { readonly type: 'target/add'; readonly x: number; readonly y: number }
  | { readonly type: 'target/move'; readonly index: number; readonly x: number; readonly y: number }
  | { readonly type: 'target/edit'; readonly index: number; readonly field: T.PointField; readonly value: number | null }
  | { readonly type: 'target/weighted'; readonly on: boolean }
  | { readonly type: 'target/delete'; readonly index: number }
  | { readonly type: 'target/clear' }
  | { readonly type: 'target/closed'; readonly closed: boolean }
  | { readonly type: 'target/timing'; readonly timing: TimingMode }
  | { readonly type: 'target/resample'; readonly count: number }
  | { readonly type: 'target/spread-angles' }
  | { readonly type: 'target/import-failed'; readonly issues: readonly CsvIssue[]; readonly source: string }
  | { readonly type: 'target/notice'; readonly notice: Notice | null }
  | { readonly type: 'background/set'; readonly background: BackgroundImage | null }
  | { readonly type: 'background/update'; readonly patch: Partial<Omit<BackgroundImage, 'imageId'>> }
  | { readonly type: 'background/calibrate'; readonly distanceMm: number }
  | { readonly type: 'ui/tool'; readonly tool: Tool }
  | { readonly type: 'ui/select'; readonly index: number | null }
  | { readonly type: 'ui/fit' }
  | { readonly type: 'ui/calibration-point'; readonly x: number; readonly y: number }
  | { readonly type: 'ui/field-issue'; readonly key: string; readonly message: string | null }
  | { readonly type: 'settings/family'; readonly family: FamilyId; readonly on: boolean }
  | { readonly type: 'settings/placement'; readonly placement: Placement }
  | { readonly type: 'settings/measure'; readonly measure: Measure }
  | { readonly type: 'settings/bound'; readonly family: FamilyId; readonly variable: string; readonly range: readonly [number, number] | null }
  | { readonly type: 'settings/full-turn'; readonly on: boolean }
  | { readonly type: 'settings/min-transmission'; readonly deg: number | null }
  | { readonly type: 'settings/link-lengths'; readonly range: readonly [number, number] | null }
  | { readonly type: 'settings/keep-out-add'; readonly region: KeepOutRegion }
  | { readonly type: 'settings/keep-out-typed'; readonly region: KeepOutRegion }
  | { readonly type: 'settings/set-aside'; readonly restore: boolean }
  | { readonly type: 'settings/keep-out-remove'; readonly index: number }
  | { readonly type: 'settings/budget'; readonly patch: Partial<Project['settings']['budget']> }
  | { readonly type: 'settings/seed'; readonly seed: number }
  | { readonly type: 'settings/workers'; readonly workers: number | null }
  | { readonly type: 'settings/checkpoint-every'; readonly seconds: number }
  | { readonly type: 'settings/max-size'; readonly spans: number | null }
  | { readonly type: 'settings/terms'; readonly patch: Partial<Project['settings']['terms']> }
  | { readonly type: 'settings/results-per-family'; readonly count: number }
  | { readonly type: 'run/update'; readonly patch: Partial<RunState> }
  | { readonly type: 'run/candidates'; readonly candidates: readonly CandidateReport[]; readonly target: TargetSnapshot };

function withTarget(state: WorkspaceState, target: TargetState, ui: Partial<UiState> = {}): WorkspaceState {
  if (target === state.project.target) return Object.keys(ui).length === 0 ? state : { ...state, ui: { ...state.ui, ...ui } };
  return { project: { ...state.project, target }, ui: { ...state.ui, ...ui } };
}

function plural(n: number, one: string): string {
  return `${n} ${one}${n === 1 ? '' : 's'}`;
}

/**
 * A new target (pasted, imported, or the points cleared to start again): the bounds and
 * keep-out regions were set in the old target's frame, so they are cleared and held
 * aside, and the settings panel offers them back.
 */
function newTarget(state: WorkspaceState, target: TargetState, ui: Partial<UiState>): WorkspaceState {
  const settings = state.project.settings;
  const kept = S.targetBound(settings);
  const bounds = Object.values(kept.bounds).reduce((sum, b) => sum + Object.keys(b ?? {}).length, 0);
  const circles = kept.keepOut.length;
  const next = withTarget(state, target, ui);
  if (bounds === 0 && circles === 0) return next;
  const what = [bounds > 0 ? plural(bounds, 'variable bound') : '', circles > 0 ? plural(circles, 'keep-out region') : ''].filter((w) => w.length > 0).join(' and ');
  return {
    project: { ...next.project, settings: S.setTargetBound(settings, { bounds: {}, keepOut: [] }) },
    ui: { ...next.ui, setAside: { ...kept, what } },
  };
}

function withSettings(state: WorkspaceState, settings: Project['settings']): WorkspaceState {
  if (settings === state.project.settings) return state;
  return { ...state, project: { ...state.project, settings } };
}

/** Target and settings stay as they are while a search runs on them. */
function locked(state: WorkspaceState): boolean {
  return isLocked(state.project.run.status);
}

function reduceTarget(state: WorkspaceState, action: Action): WorkspaceState {
  const target = state.project.target;
  switch (action.type) {
    case 'target/replace': {
      let next = T.setPoints(target, action.points);
      if (action.closed !== undefined) next = T.setClosed(next, action.closed);
      if (action.timing !== undefined) next = T.setTiming(next, action.timing);
      return newTarget(state, next, { selectedPoint: null, targetNotice: action.notice ?? null, fitRequest: state.ui.fitRequest + 1 });
    }
    case 'target/add':
      return withTarget(state, T.addPoint(target, action.x, action.y), { selectedPoint: target.points.length });
    case 'target/move':
      return withTarget(state, T.movePoint(target, action.index, action.x, action.y));
    case 'target/edit':
      return withTarget(state, T.editPoint(target, action.index, action.field, action.value));
    case 'target/delete': {
      const selected = state.ui.selectedPoint;
      const nextSelected = selected === null || selected === action.index ? null : selected > action.index ? selected - 1 : selected;
      return withTarget(state, T.deletePoint(target, action.index), { selectedPoint: nextSelected });
    }
    case 'target/clear':
      return newTarget(state, T.setPoints(target, []), { selectedPoint: null });
    case 'target/closed':
      return withTarget(state, T.setClosed(target, action.closed));
    case 'target/timing':
      return withTarget(state, T.setTiming(target, action.timing));
    case 'target/weighted':
      return withTarget(state, T.setWeighted(target, action.on));
    case 'target/spread-angles':
      return withTarget(state, T.spreadAngles(target));
    case 'target/resample': {
      const made = resamplePath(target.points, target.closed, action.count);
      if (!made.ok) return withTarget(state, target, { targetNotice: { kind: 'error', title: 'Could not resample', lines: [made.reason] } });
      return withTarget(state, T.setPoints(target, made.points), {
        selectedPoint: null,
        fitRequest: state.ui.fitRequest + 1,
        targetNotice: { kind: 'info', title: `Resampled to ${action.count} evenly spaced points`, lines: [] },
      });
    }
    case 'background/set':
      return withTarget(state, T.setBackground(target, action.background), { calibration: [], fitRequest: state.ui.fitRequest + 1 });
    case 'background/update':
      return withTarget(state, T.updateBackground(target, action.patch));
    case 'background/calibrate': {
      const [a, b] = state.ui.calibration;
      if (a === undefined || b === undefined) {
        return withTarget(state, target, { targetNotice: { kind: 'error', title: 'Calibration needs two points', lines: ['Click two points on the image whose distance you know.'] } });
      }
      const done = T.calibrateBackground(target, a, b, action.distanceMm);
      if (!done.ok) return withTarget(state, target, { targetNotice: { kind: 'error', title: 'Could not calibrate', lines: [done.reason] } });
      return withTarget(state, done.target, {
        calibration: [],
        fitRequest: state.ui.fitRequest + 1,
        tool: 'point',
        targetNotice: { kind: 'info', title: `Image calibrated: ${action.distanceMm} mm between the two points`, lines: [] },
      });
    }
    default:
      return state;
  }
}

function reduceSettings(state: WorkspaceState, action: Action): WorkspaceState {
  const s = state.project.settings;
  switch (action.type) {
    case 'settings/family':
      return withSettings(state, S.toggleFamily(s, action.family, action.on));
    case 'settings/placement':
      return withSettings(state, S.setPlacement(s, action.placement));
    case 'settings/measure':
      return withSettings(state, S.setMeasure(s, action.measure));
    case 'settings/bound':
      return withSettings(state, S.setBound(s, action.family, action.variable, action.range));
    case 'settings/full-turn':
      return withSettings(state, S.setFullTurnCrank(s, action.on));
    case 'settings/min-transmission':
      return withSettings(state, S.setMinTransmission(s, action.deg));
    case 'settings/link-lengths':
      return withSettings(state, S.setLinkLengths(s, action.range));
    case 'settings/keep-out-add':
      return withSettings(state, S.addDrawnKeepOut(s, action.region));
    case 'settings/keep-out-typed':
      return withSettings(state, S.addKeepOut(s, action.region));
    case 'settings/set-aside': {
      const aside = state.ui.setAside;
      if (aside === null) return state;
      const next = action.restore ? withSettings(state, S.setTargetBound(s, aside)) : state;
      return { ...next, ui: { ...next.ui, setAside: null } };
    }
    case 'settings/keep-out-remove':
      return withSettings(state, S.removeKeepOut(s, action.index));
    case 'settings/budget':
      return withSettings(state, S.setBudget(s, action.patch));
    case 'settings/seed':
      return withSettings(state, S.setSeed(s, action.seed));
    case 'settings/workers':
      return withSettings(state, S.setWorkers(s, action.workers));
    case 'settings/checkpoint-every':
      return withSettings(state, S.setCheckpointEvery(s, action.seconds));
    case 'settings/max-size':
      return withSettings(state, S.setMaxSizeSpans(s, action.spans));
    case 'settings/terms':
      return withSettings(state, S.setTerms(s, action.patch));
    case 'settings/results-per-family':
      return withSettings(state, S.setResultsPerFamily(s, action.count));
    default:
      return state;
  }
}

/**
 * "Resumed after a reload" belongs to the stretch of searching that followed the reload:
 * a pause, a stop or the end closes it, so a later Resume or a finished run does not
 * still claim it.
 */
function updateRun(run: RunState, patch: Partial<RunState>): RunState {
  const next = { ...run, ...patch };
  const closes = patch.status !== undefined && patch.status !== 'starting' && patch.status !== 'running';
  return closes && patch.resumedFrom === undefined ? { ...next, resumedFrom: null } : next;
}

export function reduce(state: WorkspaceState, action: Action): WorkspaceState {
  const kind = action.type.slice(0, action.type.indexOf('/'));
  switch (kind) {
    case 'target':
    case 'background':
      if (locked(state) && action.type !== 'target/import-failed' && action.type !== 'target/notice') {
        return { ...state, ui: { ...state.ui, targetNotice: { kind: 'info', title: 'A search is running on this target', lines: ['Stop it to change the target (a paused search, too).'] } } };
      }
      if (action.type === 'target/import-failed') {
        return {
          ...state,
          ui: { ...state.ui, targetNotice: { kind: 'error', title: `Could not read ${action.source}; the target is unchanged`, lines: action.issues.map((i) => i.message) } },
        };
      }
      if (action.type === 'target/notice') return { ...state, ui: { ...state.ui, targetNotice: action.notice } };
      return reduceTarget(state, action);
    case 'settings':
      return locked(state) ? state : reduceSettings(state, action);
    default:
      break;
  }
  switch (action.type) {
    case 'project/load':
      return { project: action.project, ui: { ...state.ui, selectedPoint: null, calibration: [], setAside: null, fitRequest: state.ui.fitRequest + 1 } };
    case 'project/suspension':
      return state.project.suspension === action.suspension ? state : { ...state, project: { ...state.project, suspension: action.suspension } };
    case 'project/leg':
      return state.project.leg === action.leg ? state : { ...state, project: { ...state.project, leg: action.leg } };
    case 'project/rename': {
      const named = checkProjectName(action.name);
      if (!named.ok || named.value === state.project.name) return state;
      return { ...state, project: { ...state.project, name: named.value } };
    }
    case 'ui/field-issue': {
      const issues = state.ui.fieldIssues;
      if ((issues[action.key] ?? null) === action.message) return state;
      const next = { ...issues };
      if (action.message === null) delete next[action.key];
      else next[action.key] = action.message;
      return { ...state, ui: { ...state.ui, fieldIssues: next } };
    }
    case 'storage/status':
      return { ...state, ui: { ...state.ui, storage: action.storage } };
    case 'ui/tool':
      return { ...state, ui: { ...state.ui, tool: action.tool, calibration: [] } };
    case 'ui/select':
      return { ...state, ui: { ...state.ui, selectedPoint: action.index } };
    case 'ui/fit':
      return { ...state, ui: { ...state.ui, fitRequest: state.ui.fitRequest + 1 } };
    case 'ui/calibration-point': {
      const calibration = state.ui.calibration.length >= 2 ? [{ x: action.x, y: action.y }] : [...state.ui.calibration, { x: action.x, y: action.y }];
      return { ...state, ui: { ...state.ui, calibration } };
    }
    case 'run/update':
      return { ...state, project: { ...state.project, run: updateRun(state.project.run, action.patch) } };
    case 'run/candidates':
      return { ...state, project: { ...state.project, candidates: action.candidates, candidatesTarget: action.target } };
    default:
      return state;
  }
}

export { IDLE_RUN };
