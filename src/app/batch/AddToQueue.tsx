/**
 * "Add to queue" beside a rear-suspension or walking-leg search's Start: the job keeps
 * the workspace's problem as it is now (the layouts or families ticked there are the
 * job's), with its own name, budget and seed, checked as a path job's are; each issue is
 * said beside its field and nothing is rounded or clamped. The queue runs in the tab that
 * owns it; its summary shows the job when the queue is done.
 */
import { useId, useState, useSyncExternalStore } from 'react';
import { newJobId, queueRunner } from './bootQueue';
import { readWorkspaceJobDraft, type BudgetUnit, type JobField } from './jobInput';
import type { WorkspaceJobProblem } from './jobs';
import type { QueueRunner } from './queueRunner';
import { jobCaution, jobFamilyName, KIND_WORDS, problemFamilies } from './workspaceJobs';
import './batch.css';

export interface AddToQueueProps {
  /** The workspace's problem when its set-up reads whole, else null (`why` says what is missing). */
  readonly problem: WorkspaceJobProblem | null;
  readonly why: string | null;
  /** The workspace's own seed and budget, the fields' first values. */
  readonly seed: number;
  readonly budget: { readonly evaluations: number | null; readonly seconds: number | null };
  readonly workers: number;
}

export function AddToQueue(props: AddToQueueProps) {
  const runner = queueRunner();
  if (runner === null) return null;
  return <AddToQueueForm runner={runner} {...props} />;
}

function Issue({ id, text }: { id: string; text: string | undefined }) {
  return text === undefined ? null : <span className="field-error" id={id} data-testid="queue-field-error">{text}</span>;
}

function AddToQueueForm({ runner, problem, why, seed: workspaceSeed, budget: workspaceBudget, workers }: AddToQueueProps & { runner: QueueRunner }) {
  const view = useSyncExternalStore(runner.subscribe, runner.snapshot);
  const jobs = view.state.jobs;
  const [open, setOpen] = useState(false);
  const [name, setName] = useState('');
  const [unit, setUnit] = useState<BudgetUnit>(workspaceBudget.evaluations === null ? 'seconds' : 'evaluations');
  const [budget, setBudget] = useState<string | null>(null);
  const [seed, setSeed] = useState<string | null>(null);
  const [touched, setTouched] = useState<ReadonlySet<JobField>>(new Set());
  const [added, setAdded] = useState<string | null>(null);
  const ids = useId();
  const kind = problem?.kind ?? null;

  const draft = {
    name,
    families: problem === null ? [] : [...problemFamilies(problem)],
    budgetUnit: unit,
    budget: budget ?? String((unit === 'seconds' ? workspaceBudget.seconds : workspaceBudget.evaluations) ?? ''),
    seed: seed ?? String(workspaceSeed),
  };
  const read = problem === null ? null : readWorkspaceJobDraft(draft, jobs.map((j) => j.spec), problem, workers);
  const issues = read === null || read.ok ? {} : read.issues;
  const shown = (field: JobField) => (touched.has(field) ? issues[field] : undefined);
  const touch = (field: JobField) => setTouched((t) => new Set([...t, field]));
  const invalid = (field: JobField) => shown(field) !== undefined;
  const mine = view.owner === 'self';

  const submit = () => {
    setTouched(new Set<JobField>(['name', 'families', 'budget', 'seed', 'problem']));
    setAdded(null);
    if (read === null || !read.ok || !runner.add(newJobId(), read.spec)) return;
    setAdded(`Added "${read.spec.name}" to the queue; start the queue from the path workspace's Batch queue panel (it runs in this tab, one job after another).`);
    setName('');
    setTouched(new Set());
  };

  if (!open) {
    return (
      <button type="button" onClick={() => setOpen(true)} disabled={problem === null || !mine} data-testid="add-to-queue-open"
        title={problem === null ? `Not ready: ${why ?? 'the set-up is not complete'}` : !mine ? 'Another Loci tab runs the queue' : undefined}>
        Add to queue…
      </button>
    );
  }
  const caution = kind === null ? null : jobCaution(kind);
  return (
    <form className="batch-form" aria-label="Add this problem to the queue" data-testid="add-to-queue" onSubmit={(e) => { e.preventDefault(); submit(); }}>
      <fieldset disabled={!mine || problem === null}>
        <legend>Add this problem to the batch queue</legend>
        {caution !== null && <p className="option-note batch-caution" role="note"><strong>Caution.</strong> {caution}</p>}
        <p className="panel-note">
          {problem === null || kind === null
            ? `Not ready: ${why ?? 'the set-up is not complete'}.`
            : `The job keeps this ${KIND_WORDS[kind]} problem as it is now, with its ${kind === 'suspension' ? 'layouts' : 'families'} ${problemFamilies(problem).map((f) => jobFamilyName(kind, f)).join(', ')}; later edits here do not change it.`}
        </p>
        {!mine && <p className="panel-note">Another Loci tab runs the queue: add the job there.</p>}
        <div className="field-row">
          <label htmlFor={`${ids}-name`}>Job name</label>
          <input id={`${ids}-name`} type="text" value={name} aria-invalid={invalid('name')} aria-describedby={invalid('name') ? `${ids}-name-error` : undefined}
            className={invalid('name') ? 'invalid' : undefined} onChange={(e) => { setName(e.target.value); touch('name'); }} />
          <Issue id={`${ids}-name-error`} text={shown('name')} />
        </div>
        {shown('families') !== undefined && <p className="field-error" data-testid="queue-field-error">{shown('families')}</p>}
        <div className="field-row">
          <label htmlFor={`${ids}-budget`}>Job budget</label>
          <input id={`${ids}-budget`} className={`number${invalid('budget') ? ' invalid' : ''}`} inputMode="decimal" value={draft.budget}
            aria-invalid={invalid('budget')} aria-describedby={invalid('budget') ? `${ids}-budget-error` : undefined}
            onChange={(e) => { setBudget(e.target.value); touch('budget'); }} />
          <select aria-label="Job budget unit" value={unit} onChange={(e) => { setUnit(e.target.value as BudgetUnit); setBudget(null); }}>
            <option value="evaluations">evaluations</option>
            <option value="seconds">seconds (s)</option>
          </select>
          <Issue id={`${ids}-budget-error`} text={shown('budget')} />
        </div>
        <div className="field-row">
          <label htmlFor={`${ids}-seed`}>Job seed</label>
          <input id={`${ids}-seed`} className={`number${invalid('seed') ? ' invalid' : ''}`} inputMode="numeric" value={draft.seed}
            aria-invalid={invalid('seed')} aria-describedby={invalid('seed') ? `${ids}-seed-error` : undefined}
            onChange={(e) => { setSeed(e.target.value); touch('seed'); }} />
          <span className="option-note">whole number ≥ 0; the same seed and an evaluation budget repeat a search exactly</span>
          <Issue id={`${ids}-seed-error`} text={shown('seed')} />
        </div>
        {shown('problem') !== undefined && <p className="field-error" data-testid="queue-field-error">This problem cannot be searched as a job: {shown('problem')}</p>}
        <div className="row-actions">
          <button type="submit">Add to queue</button>
          <button type="button" onClick={() => setOpen(false)}>Close</button>
          {added !== null && <span role="status" className="panel-note" data-testid="queue-added">{added}</span>}
        </div>
      </fieldset>
    </form>
  );
}
