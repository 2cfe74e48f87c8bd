import type { PointBatch } from './batch';
import type { BestTracker } from './ranking';
import type { BestPoint, StopReason } from './types';

/**
 * What every optimizer keeps the same way: the evaluations told, why the search
 * stopped (null while it runs), and the best point so far under Deb's rules.
 */
export abstract class OptimizerBase {
  protected evaluationsTold: number;
  protected stop: StopReason | null;
  protected readonly bestPoint: BestTracker;

  protected constructor(evaluations: number, stop: StopReason | null, best: BestTracker) {
    this.evaluationsTold = evaluations;
    this.stop = stop;
    this.bestPoint = best;
  }

  best(): BestPoint {
    const b = this.bestPoint;
    return { x: Float64Array.from(b.x), value: b.value, violation: b.violation };
  }

  /** The best point so far itself, not a copy (as `best()` gives): to read, for a scheme that checks it after every batch. */
  bestSoFar(): Readonly<BestTracker> {
    return this.bestPoint;
  }

  done(): boolean {
    return this.stop !== null;
  }

  stopReason(): StopReason | null {
    return this.stop;
  }

  evaluations(): number {
    return this.evaluationsTold;
  }
}

/**
 * An optimizer with a pending batch of its own, which `ask` hands out and `tell` takes
 * back (differential evolution, Nelder–Mead; the hybrid delegates to one of them).
 */
export abstract class BatchOptimizerBase extends OptimizerBase {
  protected readonly batch: PointBatch;

  protected constructor(evaluations: number, stop: StopReason | null, best: BestTracker, batch: PointBatch) {
    super(evaluations, stop, best);
    this.batch = batch;
  }

  ask(): readonly Float64Array[] {
    return this.batch.points();
  }

  /** Checks that `points` are the batch asked for, with a value (and violation) each; returns how many. */
  protected received(points: readonly Float64Array[], values: Float64Array, violations?: Float64Array): number {
    this.batch.check(points, values, violations);
    return this.batch.count;
  }
}
