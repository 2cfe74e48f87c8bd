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
