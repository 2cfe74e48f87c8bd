/**
 * Adding a job: its name, families, budget (with its unit) and seed; the workspace's
 * target and settings as they are now go with it. What is wrong is said beside each
 * field as it is typed, and the job is added only when nothing is.
 */
import { useId, useMemo, useState } from 'react';
import { FAMILY_CHOICES } from '../state/families';
import { IDLE_RUN, PROJECT_FORMAT, PROJECT_VERSION, type Project } from '../state/project';
import { useWorkspace } from '../state/store';
import type { AppQueueEntry } from './jobs';
import { readJobDraft, type BudgetUnit, type JobDraft, type JobField } from './jobInput';
import type { AppJobSpec } from './jobs';

export interface JobFormProps {
  readonly jobs: readonly AppQueueEntry[];
  readonly defaultWorkers: number;
  readonly disabled: boolean;
  readonly onAdd: (spec: AppJobSpec) => boolean;
}

function freeName(jobs: readonly AppQueueEntry[]): string {
  const taken = new Set(jobs.map((j) => j.spec.name.toLowerCase()));
  for (let n = jobs.length + 1; n < jobs.length + 1000; n++) if (!taken.has(`job-${n}`)) return `job-${n}`;
  return '';
}

function Issue({ id, text }: { id: string; text: string | undefined }) {
  return text === undefined ? null : <span className="field-error" id={id} data-testid="job-field-error">{text}</span>;
}

export function JobForm({ jobs, defaultWorkers, disabled, onAdd }: JobFormProps) {
  const target = useWorkspace((s) => s.project.target);
  const settings = useWorkspace((s) => s.project.settings);
  const projectName = useWorkspace((s) => s.project.name);
  const [name, setName] = useState<string | null>(null);
  const [families, setFamilies] = useState<readonly string[] | null>(null);
  const [unit, setUnit] = useState<BudgetUnit>(settings.budget.mode === 'time' ? 'seconds' : 'evaluations');
  const [budget, setBudget] = useState<string | null>(null);
  const [seed, setSeed] = useState(String(settings.seed));
  const [touched, setTouched] = useState<ReadonlySet<JobField>>(new Set());
  const [added, setAdded] = useState<string | null>(null);
  const ids = useId();
  const workers = settings.workers ?? defaultWorkers;

  const draft: JobDraft = useMemo(() => ({
    name: name ?? freeName(jobs),
    families: families ?? settings.families,
    budgetUnit: unit,
    budget: budget ?? String(unit === 'seconds' ? settings.budget.seconds : settings.budget.evaluations),
    seed,
  }), [name, jobs, families, settings, unit, budget, seed]);
  const read = useMemo(() => {
    const project: Project = { format: PROJECT_FORMAT, version: PROJECT_VERSION, name: projectName, target, settings, run: IDLE_RUN, candidates: [], candidatesTarget: null };
    return readJobDraft(draft, jobs.map((j) => j.spec), project, workers);
  }, [draft, jobs, projectName, target, settings, workers]);
  const issues = read.ok ? {} : read.issues;
  const shown = (field: JobField) => (touched.has(field) ? issues[field] : undefined);
  const touch = (field: JobField) => setTouched((t) => new Set([...t, field]));
  const invalid = (field: JobField) => shown(field) !== undefined;

  const submit = () => {
    setTouched(new Set<JobField>(['name', 'families', 'budget', 'seed', 'problem']));
    setAdded(null);
    if (!read.ok || !onAdd(read.spec)) return;
    setAdded(`Added "${read.spec.name}" to the queue.`);
    setName(null);
    setTouched(new Set());
  };

  const points = target.points.length;
  return (
    <form className="batch-form" aria-label="Add a job" onSubmit={(e) => { e.preventDefault(); submit(); }}>
      <fieldset disabled={disabled}>
        <legend>Add a job</legend>
        <p className="panel-note">
          The job keeps the workspace's target ({points} point{points === 1 ? '' : 's'}, {target.closed ? 'closed loop' : 'open path'}) and search settings as
          they are now; later edits in the workspace do not change it.
        </p>
        <div className="field-row">
          <label htmlFor={`${ids}-name`}>Job name</label>
          <input id={`${ids}-name`} type="text" value={draft.name} aria-invalid={invalid('name')} aria-describedby={invalid('name') ? `${ids}-name-error` : undefined}
            className={invalid('name') ? 'invalid' : undefined} onChange={(e) => { setName(e.target.value); touch('name'); }} />
          <Issue id={`${ids}-name-error`} text={shown('name')} />
        </div>
        <fieldset className="batch-families" aria-describedby={invalid('families') ? `${ids}-families-error` : undefined}>
          <legend>Families to search</legend>
          {FAMILY_CHOICES.map((f) => (
            <label key={f.id} className="family">
              {/* Named for the job, so it is told apart from the workspace's own family ticks. */}
              <input type="checkbox" aria-label={`${f.label}, for this job`} checked={draft.families.includes(f.id)}
                onChange={(e) => {
                  setFamilies(e.target.checked ? FAMILY_CHOICES.map((c) => c.id).filter((id) => id === f.id || draft.families.includes(id)) : draft.families.filter((id) => id !== f.id));
                  touch('families');
                }} />{' '}
              {f.label}
            </label>
          ))}
          <Issue id={`${ids}-families-error`} text={shown('families')} />
        </fieldset>
        <div className="field-row">
          <label htmlFor={`${ids}-budget`}>Job budget</label>
          <input id={`${ids}-budget`} className={`number${invalid('budget') ? ' invalid' : ''}`} inputMode="decimal" value={draft.budget}
            aria-invalid={invalid('budget')} aria-describedby={invalid('budget') ? `${ids}-budget-error` : undefined}
            onChange={(e) => { setBudget(e.target.value); touch('budget'); }} />
          <select aria-label="Budget unit" value={unit} onChange={(e) => { setUnit(e.target.value as BudgetUnit); setBudget(null); }}>
            <option value="evaluations">evaluations</option>
            <option value="seconds">seconds (s)</option>
          </select>
          <Issue id={`${ids}-budget-error`} text={shown('budget')} />
        </div>
        <div className="field-row">
          <label htmlFor={`${ids}-seed`}>Job seed</label>
          <input id={`${ids}-seed`} className={`number${invalid('seed') ? ' invalid' : ''}`} inputMode="numeric" value={seed}
            aria-invalid={invalid('seed')} aria-describedby={invalid('seed') ? `${ids}-seed-error` : undefined}
            onChange={(e) => { setSeed(e.target.value); touch('seed'); }} />
          <span className="option-note">whole number ≥ 0; the same seed and an evaluation budget repeat a search exactly</span>
          <Issue id={`${ids}-seed-error`} text={shown('seed')} />
        </div>
        {shown('problem') !== undefined && (
          <p className="field-error" data-testid="job-field-error">The workspace's target or settings cannot be searched: {shown('problem')}</p>
        )}
        <div className="row-actions">
          <button type="submit">Add to queue</button>
          {added !== null && <span role="status" className="panel-note">{added}</span>}
        </div>
      </fieldset>
    </form>
  );
}
