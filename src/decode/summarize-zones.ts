import type { DecodedRun } from './decode-run.js';
import type { DecodeThresholds } from './decode-thresholds.js';

/** The run summary's zone columns and gap count (docs/formats.md, "Run summary"). */
export interface ZoneSummary {
  /** Steps missing from the input (gaps in `step`), decoded as dropouts. */
  gapSteps: number;
  /** Mean of `zone_p` over the run's steps; NaN when the model has no zones or the run was not decoded. */
  meanZoneP: number;
  /** Steps whose `zone_p` is below `th.lowConfidence` (0 when the model has no zones or the run was not decoded). */
  lowConfidenceZoneSteps: number;
}

/**
 * Zone-level summary of one decoded run (decoded with positions). `rows` is the run's input row per
 * step, −1 for a missing step. Like `mean_path_p`, means run over every step, gaps included.
 */
export function summarizeZones(rows: Int32Array | ArrayLike<number>, dec: DecodedRun, th: DecodeThresholds, hasZones: boolean): ZoneSummary {
  const T = rows.length;
  let gapSteps = 0;
  for (let t = 0; t < T; t++) if (rows[t] < 0) gapSteps++;
  const zoneP = dec.positions?.zoneP;
  if (!hasZones || !zoneP || dec.logLik === -Infinity || T === 0) return { gapSteps, meanZoneP: NaN, lowConfidenceZoneSteps: 0 };
  let sum = 0;
  let low = 0;
  for (let t = 0; t < T; t++) {
    sum += zoneP[t];
    if (zoneP[t] < th.lowConfidence) low++;
  }
  return { gapSteps, meanZoneP: sum / T, lowConfidenceZoneSteps: low };
}
