import { WorkError } from '../errors.js';
import type { HmmModel, MovementParams, TransitionMode, TransitionStructure } from '../model/hmm-model.js';
import { linkBearings } from '../model/link-bearings.js';
import { modelMessage, type ModelMessage } from '../fit/model-message.js';
import { packBlob, unpackBlob } from './blob.js';

export const MODEL_FORMAT = 'underfoot-fleet-model/1';

/** What a block's E-step needs besides the model: the fit it belongs to, the model's version, the E-step settings. */
export interface ModelTag {
  fit: string;
  version: number;
  /** The M-step the counts are for (see `accumulateBlock`). */
  mode: TransitionMode;
  /** `fit --prune` (0 = exact E-step). */
  prune: number;
}

const MODES: readonly TransitionMode[] = ['fixed', 'tied', 'per-cell', 'learned'];

/** The numeric model (as `modelMessage` sends it to threads) as one payload, sent once per model version. */
export function packModelPayload(model: HmmModel, tag: ModelTag): Buffer {
  const s = model.structure;
  const bearings = model.movement ? linkBearings(s, model.cells) : null;
  return packBlob(
    { format: MODEL_FORMAT, ...tag, nCells: s.nCells, nnz: s.nnz, surfaces: model.surfaces, movement: model.movement ?? null },
    [s.succPtr, s.succIdx, s.predPtr, s.predIdx, s.predToSucc, s.dwellPos, model.start, model.trans, model.emission, ...(bearings ? [bearings] : [])],
  );
}

/**
 * A model payload, checked before use: format, fit key and version as the job names them, sizes that
 * agree, CSR/CSC indices inside the model, probabilities finite and ≥ 0. Returns the message a
 * thread builds its kernels' view from (`chainFromModel`).
 */
export function readModelPayload(bytes: Uint8Array, expect: { fit: string; version: number }, what: string): { message: ModelMessage; tag: ModelTag } {
  const { header: h, arrays } = unpackBlob(bytes, what);
  const bad = (thing: string, requirement: string, got: unknown): never => {
    throw new WorkError(`${what}: ${thing} must ${requirement}, got ${JSON.stringify(got)?.slice(0, 80)}`);
  };
  if (h.format !== MODEL_FORMAT) bad('the format', `be ${MODEL_FORMAT}`, h.format);
  if (h.fit !== expect.fit) bad('the fit key', `be this job's fit (${expect.fit.slice(0, 12)}…)`, h.fit);
  if (h.version !== expect.version) bad('the model version', `be this job's (${expect.version})`, h.version);
  if (!MODES.includes(h.mode as TransitionMode)) bad('the mode', `be one of ${MODES.join(', ')}`, h.mode);
  if (typeof h.prune !== 'number' || !(h.prune >= 0 && h.prune <= 0.1)) bad('prune', 'be a number from 0 to 0.1', h.prune);
  const n = h.nCells as number;
  const nnz = h.nnz as number;
  if (!Number.isSafeInteger(n) || n < 1) bad('the cell count', 'be a whole number ≥ 1', n);
  if (!Number.isSafeInteger(nnz) || nnz < 1) bad('the transition count', 'be a whole number ≥ 1', nnz);
  const surfaces = h.surfaces;
  if (!Array.isArray(surfaces) || surfaces.length < 1 || surfaces.some((x) => typeof x !== 'string')) bad('the surfaces', 'be a list of names', surfaces);
  const m = (surfaces as string[]).length;
  let movement: MovementParams | undefined;
  if (h.movement !== null && h.movement !== undefined) {
    const mv = h.movement as Record<string, unknown>;
    if (typeof mv !== 'object' || !['stayLogit', 'stayPerMetre', 'kappa'].every((k) => Number.isFinite(mv[k]))) bad('the movement parameters', 'be finite numbers', mv);
    movement = { stayLogit: mv.stayLogit as number, stayPerMetre: mv.stayPerMetre as number, kappa: mv.kappa as number };
  }
  const want: Array<['i32' | 'f64', number]> = [
    ['i32', n + 1], ['i32', nnz], ['i32', n + 1], ['i32', nnz], ['i32', nnz], ['i32', n],
    ['f64', n], ['f64', nnz], ['f64', n * m],
  ];
  if (arrays.length !== want.length + (movement ? 1 : 0)) bad('the arrays', `be ${want.length + (movement ? 1 : 0)}`, arrays.length);
  want.forEach(([type, length], k) => {
    const a = arrays[k];
    if ((type === 'i32') !== a instanceof Int32Array || a.length !== length) bad(`array ${k + 1}`, `be ${type} × ${length}`, `${a instanceof Int32Array ? 'i32' : 'f64'} × ${a.length}`);
  });
  const [succPtr, succIdx, predPtr, predIdx, predToSucc, dwellPos] = arrays.slice(0, 6) as Int32Array[];
  const [start, trans, emission] = arrays.slice(6, 9) as Float64Array[];
  for (const [name, ptr] of [['succPtr', succPtr], ['predPtr', predPtr]] as const) {
    if (ptr[0] !== 0 || ptr[n] !== nnz) bad(name, `run from 0 to ${nnz}`, [ptr[0], ptr[n]]);
    for (let i = 0; i < n; i++) if (ptr[i + 1] < ptr[i]) bad(name, 'never decrease', i);
  }
  const inRange = (a: Int32Array, lo: number, hi: number, name: string): void => {
    for (let k = 0; k < a.length; k++) if (!(a[k] >= lo && a[k] < hi)) bad(`every entry of ${name}`, `be from ${lo} to ${hi - 1}`, a[k]);
  };
  inRange(succIdx, 0, n, 'succIdx');
  inRange(predIdx, 0, n, 'predIdx');
  inRange(predToSucc, 0, nnz, 'predToSucc');
  inRange(dwellPos, -1, nnz, 'dwellPos');
  for (const [name, a] of [['start', start], ['trans', trans], ['emission', emission]] as const) {
    for (let k = 0; k < a.length; k++) if (!(a[k] >= 0 && a[k] <= 1)) bad(`every ${name} probability`, 'be from 0 to 1', a[k]);
  }
  const structure: TransitionStructure = { nCells: n, nnz, succPtr, succIdx, predPtr, predIdx, predToSucc, dwellPos };
  const message = modelMessage({ surfaces: surfaces as string[], structure, start, trans, emission, movement }, expect.version);
  if (movement) {
    // One bearing per link (dwell excluded, see `linkBearings`): radians, or NaN for a link without one.
    let nLinks = 0;
    for (let i = 0; i < n; i++) for (let k = succPtr[i]; k < succPtr[i + 1]; k++) if (succIdx[k] !== i) nLinks++;
    const bearing = arrays[9];
    if (!(bearing instanceof Float64Array) || bearing.length !== nLinks) bad('the link bearings', `be f64 × ${nLinks}`, bearing.length);
    for (let k = 0; k < bearing.length; k++) if (!Number.isNaN(bearing[k]) && !(Math.abs(bearing[k]) <= Math.PI)) bad('every link bearing', 'be from −π to π or NaN', bearing[k]);
    message.linkBearing = bearing as Float64Array;
  }
  return { message, tag: { fit: expect.fit, version: expect.version, mode: h.mode as TransitionMode, prune: h.prune as number } };
}
