import { WorkError } from '../errors.js';
import { DISTANCE_BINS, HEADING_BINS } from '../kernels/move-chain.js';
import type { BlockCounts } from '../fit/accumulate-block.js';
import type { BlockScore } from '../fit/score-block.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import { packBlob, unpackBlob } from './blob.js';

export const RESULT_FORMAT = 'underfoot-fleet-result/1';

/** Which job a result answers: the fit, the call (one per E-step or scoring pass), the block's index. */
export interface ResultTag {
  fit: string;
  version: number;
  call: number;
  block: number;
  kind: 'counts' | 'score';
}

/** One block's result as a payload: every count array as it is (bit for bit), the scalars as float64. */
export function packBlockResult(result: BlockCounts | BlockScore, tag: ResultTag): Buffer {
  if (tag.kind === 'score') {
    const s = result as BlockScore;
    return packBlob({ format: RESULT_FORMAT, ...tag }, [Float64Array.of(s.logLik, s.nReadings, s.impossibleRun)]);
  }
  const { counts: c, impossibleRun } = result as BlockCounts;
  const move = c.move ? [c.move.stayByDistance, c.move.moveByDistance, c.move.moveByHeading, c.move.headingCos, c.move.headingSin] : [];
  return packBlob({ format: RESULT_FORMAT, ...tag, move: c.move !== undefined }, [Float64Array.of(c.logLik, c.nReadings, c.nRuns, impossibleRun), c.start, c.trans, c.emitT, ...move]);
}

/**
 * A block's result, checked before it is reduced: format, and the tag of the job it must answer (a
 * result of another fit, model version, call or block is refused), sizes of the model's, counts finite.
 */
export function readBlockResult(
  bytes: Uint8Array,
  expect: ResultTag,
  dims: { nCells: number; nnz: number; nReadings: number },
  what: string,
): BlockCounts | BlockScore {
  const { header: h, arrays } = unpackBlob(bytes, what);
  const bad = (thing: string, requirement: string, got: unknown): never => {
    throw new WorkError(`${what}: ${thing} must ${requirement}, got ${JSON.stringify(got)?.slice(0, 80)}`);
  };
  if (h.format !== RESULT_FORMAT) bad('the format', `be ${RESULT_FORMAT}`, h.format);
  for (const key of ['fit', 'version', 'call', 'block', 'kind'] as const) {
    if (h[key] !== expect[key]) bad(`the result's ${key}`, `be this job's (${String(expect[key]).slice(0, 16)})`, h[key]);
  }
  if (arrays.length < 1 || !(arrays[0] instanceof Float64Array)) bad('the scalars', 'come first', arrays.length);
  const scalars = arrays[0] as Float64Array;
  const impossible = (x: number): number => {
    if (!Number.isInteger(x) || x < -1) bad('the impossible run', 'be −1 or a run index', x);
    return x;
  };
  if (expect.kind === 'score') {
    if (arrays.length !== 1 || scalars.length !== 3) bad('a score', 'be three numbers', scalars.length);
    return { logLik: scalars[0], nReadings: scalars[1], impossibleRun: impossible(scalars[2]) };
  }
  const { nCells: n, nnz, nReadings: m } = dims;
  const move = h.move === true;
  const lengths = [4, n, nnz, m * n, ...(move ? [DISTANCE_BINS, DISTANCE_BINS, HEADING_BINS * n, HEADING_BINS, HEADING_BINS] : [])];
  if (arrays.length !== lengths.length || arrays.some((a, k) => !(a instanceof Float64Array) || a.length !== lengths[k])) {
    bad('the count arrays', `have the lengths ${lengths.join(', ')}`, arrays.map((a) => a.length));
  }
  const [, start, trans, emitT, ...mv] = arrays as Float64Array[];
  const impossibleRun = impossible(scalars[3]);
  if (impossibleRun < 0) {
    for (const a of arrays.slice(1)) for (let k = 0; k < a.length; k++) if (!Number.isFinite(a[k])) bad('every count', 'be finite', a[k]);
  }
  const counts: ExpectedCountsTable = { start, trans, emitT, logLik: scalars[0], nReadings: scalars[1], nRuns: scalars[2] };
  if (move) counts.move = { stayByDistance: mv[0], moveByDistance: mv[1], moveByHeading: mv[2], headingCos: mv[3], headingSin: mv[4] };
  return { counts, impossibleRun };
}
