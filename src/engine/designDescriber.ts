/**
 * Describes designs outside a run: a worker of its own builds the objective a spec names
 * and reports each design in full. The app uses it for the candidates a checkpoint holds,
 * so the table fills while a search runs and straight after a reload, and the page
 * itself evaluates nothing.
 */
import type { DescribedCandidate, ObjectiveSpec } from '../../workers/api';
import type { EngineEnvironment } from './environment';
import { WorkerClient } from './workerClient';

/** A describe call takes no longer than this, ms; past it the worker is replaced. */
export const DESCRIBE_TIMEOUT_MS = 30_000;

export type DescribeResult = { readonly ok: true; readonly candidates: DescribedCandidate[] } | { readonly ok: false; readonly reason: string };

export class DesignDescriber {
  private readonly env: EngineEnvironment;
  private worker: WorkerClient | null = null;
  private closed = false;

  constructor(env: EngineEnvironment) {
    this.env = env;
  }

  /** Each design (real coordinates) evaluated and described by the objective `objective` names. */
  async describe(objective: ObjectiveSpec, designs: readonly (readonly number[])[]): Promise<DescribeResult> {
    if (this.closed) return { ok: false, reason: 'the describer is closed' };
    if (this.worker === null || this.worker.failure !== null) {
      if (this.worker !== null) void this.worker.close();
      this.worker = new WorkerClient(0, this.env.spawnWorker());
    }
    const worker = this.worker;
    try {
      const answer = await worker.call('describeDesigns', DESCRIBE_TIMEOUT_MS, (api) => api.describeDesigns(objective, designs));
      return { ok: true, candidates: answer.candidates };
    } catch (error) {
      return { ok: false, reason: error instanceof Error ? error.message : String(error) };
    }
  }

  /** Stops the worker; later calls answer { ok: false }. */
  close(): void {
    this.closed = true;
    const worker = this.worker;
    this.worker = null;
    if (worker !== null) void worker.close();
  }
}
