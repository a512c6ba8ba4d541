import type { RunRow } from './report-data.js';

/** Share of a run's steps flagged low-confidence; NaN for a run without steps. */
export function lowConfidenceShare(r: RunRow): number {
  return r.steps > 0 ? r.lowConfidenceSteps / r.steps : NaN;
}
