/**
 * The search set-up panel: the layouts to search, the targets, the pivot regions, the
 * keep-out circles, the budget and the seed, each typed, with the reader's message beside
 * the field it is about, and a status that says whether the problem is ready to search.
 */
import { memo, useMemo } from 'react';
import { LAYOUT_KINDS, LAYOUT_NAMES } from '../../../core/suspension';
import { DEFAULT_SUSPENSION_STEPS } from '../../../core/synthesis/suspensionProblem';
import { useSuspension } from '../store';
import { KeepOutList } from './KeepOutList';
import { RegionsTable } from './RegionsTable';
import { readSearchProblem, type SearchProblemReading } from './searchProblem';
import { FieldIssue, SetupField, SetupIssuesContext, useSetupDispatch, type IssuesByField } from './SetupField';
import { TargetFields } from './TargetFields';

const LayoutChoice = memo(function LayoutChoice() {
  const layouts = useSuspension((s) => s.search.layouts);
  const dispatch = useSetupDispatch();
  return (
    <fieldset className="susp-group susp-setup-layouts" data-field="layouts">
      <legend>Layouts to search</legend>
      {LAYOUT_KINDS.map((kind) => (
        <label key={kind} className="susp-setup-check">
          <input type="checkbox" checked={layouts.includes(kind)} onChange={(e) => dispatch({ type: 'layout', kind, on: e.target.checked })} />{' '}
          {LAYOUT_NAMES[kind]}
        </label>
      ))}
      <div className="susp-field-wide"><FieldIssue field="layouts" /></div>
    </fieldset>
  );
});

const RunFields = memo(function RunFields() {
  const budget = useSuspension((s) => s.search.budget);
  const seed = useSuspension((s) => s.search.seed);
  const steps = useSuspension((s) => s.search.steps);
  const dispatch = useSetupDispatch();
  return (
    <fieldset className="susp-group" data-field="budget">
      <legend>Budget and seed</legend>
      <SetupField field="budget.seconds" label="Time" unit="s" value={budget.seconds} hint="empty: no time limit" onChange={(text) => dispatch({ type: 'budget', field: 'seconds', text })} />
      <SetupField field="budget.evaluations" label="Evaluations" unit="designs" value={budget.evaluations} hint="empty: no count limit" onChange={(text) => dispatch({ type: 'budget', field: 'evaluations', text })} />
      <div className="susp-field-wide"><FieldIssue field="budget" /></div>
      <SetupField field="seed" label="Seed" value={seed} hint="the same seed and budget give the same designs" onChange={(text) => dispatch({ type: 'seed', text })} />
      <SetupField field="steps" label="Travel samples per design" value={steps} hint={`empty: ${DEFAULT_SUSPENSION_STEPS}`} onChange={(text) => dispatch({ type: 'steps', text })} />
    </fieldset>
  );
});

function Status({ reading }: { reading: SearchProblemReading }) {
  if (reading.ok) {
    const p = reading.problem;
    const targets = Object.keys(p.targets).length;
    const { seconds, evaluations } = reading.run.budget;
    const budget = [seconds === null ? null : `${seconds} s`, evaluations === null ? null : `${evaluations} evaluations`].filter((b) => b !== null).join(' or ');
    return (
      <div className="susp-setup-status susp-setup-ready" role="status" data-testid="suspension-search-problem" data-ready="true">
        <strong>Ready to search:</strong> {p.layouts.length} {p.layouts.length === 1 ? 'layout' : 'layouts'}, {targets} {targets === 1 ? 'target' : 'targets'},{' '}
        {p.keepOut.length} {p.keepOut.length === 1 ? 'keep-out' : 'keep-outs'}; stops after {budget}; seed {reading.run.seed}.
      </div>
    );
  }
  const n = reading.issues.length;
  return (
    <div className="susp-problem susp-setup-status" role="status" data-testid="suspension-search-problem" data-ready="false">
      <strong>Not ready to search: {n} {n === 1 ? 'problem' : 'problems'}</strong>, each shown beside its field:
      <ul>{reading.issues.map((i, k) => <li key={k} data-issue-field={i.field}>{i.message}</li>)}</ul>
    </div>
  );
}

export const TargetsPanel = memo(function TargetsPanel() {
  const name = useSuspension((s) => s.name);
  const draft = useSuspension((s) => s.draft);
  const search = useSuspension((s) => s.search);
  const reading = useMemo(() => readSearchProblem({ name, draft, search }), [name, draft, search]);
  const issues = useMemo<IssuesByField>(() => {
    const map = new Map<string, string[]>();
    if (!reading.ok) for (const i of reading.issues) map.set(i.field, [...(map.get(i.field) ?? []), i.message]);
    return map;
  }, [reading]);
  return (
    <section className="panel susp-panel susp-setup" aria-labelledby="susp-setup-title" data-testid="search-setup-panel">
      <h2 id="susp-setup-title">Search set-up</h2>
      <p className="susp-note">
        What a search of layouts on this bicycle aims for. Coordinates as on the bicycle: mm from the bottom-bracket centre, x forward, y up.
      </p>
      <SetupIssuesContext.Provider value={issues}>
        <LayoutChoice />
        <h3 className="susp-setup-heading">Targets</h3>
        <TargetFields />
        <h3 className="susp-setup-heading">Pivot regions</h3>
        <RegionsTable />
        <h3 className="susp-setup-heading">Keep-out circles</h3>
        <KeepOutList />
        <RunFields />
      </SetupIssuesContext.Provider>
      <Status reading={reading} />
    </section>
  );
});
