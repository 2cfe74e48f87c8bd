/**
 * What `loci fit` writes alike of a ranked candidate of a problem scored by weighted,
 * normalised terms (suspension, leg): its parameters, value, feasibility, defects and
 * terms, in that order, between its family and what its own kind adds.
 */
import type { LegCandidateReport, SuspensionCandidateReport } from '../core/synthesis';

export function weightedCandidateFields(report: LegCandidateReport | SuspensionCandidateReport) {
  return {
    parameters: report.variables,
    value: report.value,
    feasible: report.feasible,
    violation: report.violation,
    defects: report.defects,
    terms: report.terms,
  };
}
