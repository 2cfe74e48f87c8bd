/**
 * A run's clock: its active search time (worker start-up and paused time left out), over
 * this session and the sessions it resumes, and this session's evaluations per second.
 */
export class RunClock {
  private activeSinceMs: number | null = null;
  private sessionEvaluations = 0;
  private sessionActiveMs = 0;
  private sessionSinceMs: number | null = null;

  /** `elapsedBeforeMs`: the active time of the sessions this one resumes. */
  constructor(
    private readonly now: () => number,
    private elapsedBeforeMs: number,
  ) {}

  /** Active milliseconds, this session and those it resumes. */
  elapsedMs(): number {
    return this.elapsedBeforeMs + (this.activeSinceMs === null ? 0 : this.now() - this.activeSinceMs);
  }

  /** Evaluations per second of this session's active time (0 before any). */
  evaluationsPerSecond(): number {
    const sessionMs = this.sessionActiveMs + (this.sessionSinceMs === null ? 0 : this.now() - this.sessionSinceMs);
    return sessionMs > 0 ? (this.sessionEvaluations * 1000) / sessionMs : 0;
  }

  /** Evaluations done this session. */
  count(evaluations: number): void {
    this.sessionEvaluations += evaluations;
  }

  /** The search runs from now. */
  begin(): void {
    const now = this.now();
    this.activeSinceMs = now;
    this.sessionSinceMs = now;
  }

  /** The search stops (paused, ended or failed) from now. */
  end(): void {
    const now = this.now();
    if (this.activeSinceMs !== null) this.elapsedBeforeMs += now - this.activeSinceMs;
    if (this.sessionSinceMs !== null) this.sessionActiveMs += now - this.sessionSinceMs;
    this.activeSinceMs = null;
    this.sessionSinceMs = null;
  }
}
