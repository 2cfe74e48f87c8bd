// Minimal types for the parts of `fmin` 0.0.4 (a dev dependency, no types of its own) the
// tests use. See tests/support/fmin.ts for how it is loaded.
declare module 'fmin' {
  export interface NelderMeadParameters {
    maxIterations?: number;
    nonZeroDelta?: number;
    zeroDelta?: number;
    minErrorDelta?: number;
    minTolerance?: number;
    rho?: number;
    chi?: number;
    psi?: number;
    sigma?: number;
  }
  export interface NelderMeadSolution {
    fx: number;
    x: number[];
  }
  export function nelderMead(f: (x: number[]) => number, x0: number[], parameters?: NelderMeadParameters): NelderMeadSolution;
}
