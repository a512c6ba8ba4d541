import { WorkError } from '../errors.js';
import { DISTANCE_BINS, HEADING_BINS } from '../kernels/move-chain.js';
import type { PackedRuns } from '../fit/packed-runs.js';
import { packBlob, unpackBlob } from './blob.js';

export const RUNS_FORMAT = 'underfoot-fleet-runs/1';

/**
 * The fit's packed runs as one payload (`packBlob`), sent to Redis once per fit: readings (and odometry
 * bins) of every run, with the run offsets. Run ids stay with the coordinator (a worker reports a run by
 * its index). `fit` is the fit's key; a worker refuses runs packed for another fit.
 */
export function packRunsPayload(packed: PackedRuns, fit: string): Buffer {
  const arrays = [packed.offsets, packed.obs, ...(packed.dBin && packed.hBin ? [packed.dBin, packed.hBin] : [])];
  return packBlob({ format: RUNS_FORMAT, fit, nRuns: packed.ids.length, move: packed.dBin !== undefined }, arrays);
}

/** The runs of a payload, checked: format and fit key, offsets from 0 and never decreasing, codes in range. */
export interface FleetRuns {
  packed: PackedRuns;
  /** The largest reading code (−1 when every step is a dropout): a model must have more surfaces. */
  maxCode: number;
}

export function readRunsPayload(bytes: Uint8Array, fit: string, what: string): FleetRuns {
  const { header: h, arrays } = unpackBlob(bytes, what);
  const bad = (thing: string, requirement: string, got: unknown): never => {
    throw new WorkError(`${what}: ${thing} must ${requirement}, got ${JSON.stringify(got)}`);
  };
  if (h.format !== RUNS_FORMAT) bad('the format', `be ${RUNS_FORMAT}`, h.format);
  if (h.fit !== fit) bad('the fit key', `be this job's fit (${fit.slice(0, 12)}…)`, h.fit);
  const nRuns = h.nRuns;
  if (!Number.isSafeInteger(nRuns) || (nRuns as number) < 0) bad('the run count', 'be a whole number ≥ 0', nRuns);
  const move = h.move === true;
  if (arrays.length !== (move ? 4 : 2) || arrays.some((a) => !(a instanceof Int32Array))) bad('the arrays', `be ${move ? 4 : 2} integer arrays`, arrays.length);
  const [offsets, obs, dBin, hBin] = arrays as Int32Array[];
  if (offsets.length !== (nRuns as number) + 1 || offsets[0] !== 0 || offsets[offsets.length - 1] !== obs.length) bad('the run offsets', 'run from 0 to the number of steps', offsets.length);
  for (let r = 1; r < offsets.length; r++) if (offsets[r] < offsets[r - 1]) bad('the run offsets', 'never decrease', r);
  let maxCode = -1;
  for (let t = 0; t < obs.length; t++) {
    const c = obs[t];
    if (c < -1) bad('every reading code', 'be ≥ −1', c);
    if (c > maxCode) maxCode = c;
  }
  const packed: PackedRuns = { ids: Array.from({ length: nRuns as number }, (_, r) => String(r)), offsets, obs };
  if (move) {
    if (dBin.length !== obs.length || hBin.length !== obs.length) bad('the odometry bins', 'have one value per step', dBin.length);
    for (let t = 0; t < obs.length; t++) {
      if (dBin[t] < -1 || dBin[t] >= DISTANCE_BINS) bad('every distance bin', `be from −1 to ${DISTANCE_BINS - 1}`, dBin[t]);
      if (hBin[t] < -1 || hBin[t] >= HEADING_BINS) bad('every heading bin', `be from −1 to ${HEADING_BINS - 1}`, hBin[t]);
    }
    packed.dBin = dBin;
    packed.hBin = hBin;
  }
  return { packed, maxCode };
}
