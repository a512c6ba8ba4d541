import { InputError, quote } from '../errors.js';
import type { FitOptions, FitRecord, LoopRecord, PredictiveCalibration, StopReason } from '../model/fit-record.js';
import type { TransitionMode } from '../model/hmm-model.js';
import { checkKeys, expectBoolean, expectFinite, expectInteger, expectList, expectObject, expectString, got } from './json-fields.js';

const RECORD_KEYS = ['tool', 'toolVersion', 'floorDigest', 'runsDigests', 'options', 'split', 'nReadings', 'restarts', 'selected', 'selectedBy', 'finalPass', 'cellReadings', 'predictiveCalibration'];
const LOOP_KEYS = ['seed', 'iterations', 'stopReason', 'history', 'trainLogLikPerReading', 'heldOutLogLikPerReading', 'startDwell', 'mode'];
const MODES = ['fixed', 'tied', 'per-cell', 'learned'];
const STOP_REASONS: StopReason[] = ['converged', 'max-iter', 'resumed-converged'];

/**
 * Checks the `fit` record of a model file (provenance written by `fit` and `compare`) field by field, so
 * a hand-edited or damaged record is one line at read time rather than an internal error in `decode`,
 * `report` or `compare`. `cells` × `surfaces` is the size `cellReadings` must have. Extra keys in
 * `options` are allowed (a newer tool may record more options); anywhere else they are errors.
 */
export function parseFitRecord(value: unknown, where: string, cells: number, surfaces: number): FitRecord {
  const r = expectObject(value, where);
  checkKeys(r, RECORD_KEYS, where);
  const at = (k: string): string => `${where}.${k}`;
  const record: FitRecord = {
    tool: expectString(r.tool, at('tool')),
    toolVersion: expectString(r.toolVersion, at('toolVersion')),
    floorDigest: expectString(r.floorDigest, at('floorDigest')),
    runsDigests: expectList(r.runsDigests, at('runsDigests'), (item, w) => {
      const d = expectObject(item, w);
      checkKeys(d, ['file', 'sha256'], w);
      return { file: expectString(d.file, `${w}.file`), sha256: expectString(d.sha256, `${w}.sha256`) };
    }),
    options: parseFitOptions(r.options, at('options')),
    split: (() => {
      const s = expectObject(r.split, at('split'));
      checkKeys(s, ['fit', 'heldOut'], at('split'));
      return {
        fit: expectList(s.fit, at('split.fit'), (x, w) => expectString(x, w)),
        heldOut: expectList(s.heldOut, at('split.heldOut'), (x, w) => expectString(x, w)),
      };
    })(),
    nReadings: (() => {
      const n = expectObject(r.nReadings, at('nReadings'));
      checkKeys(n, ['fit', 'heldOut'], at('nReadings'));
      return { fit: expectInteger(n.fit, at('nReadings.fit'), 0), heldOut: expectInteger(n.heldOut, at('nReadings.heldOut'), 0) };
    })(),
    restarts: expectList(r.restarts, at('restarts'), (x, w) => parseLoopRecord(x, w)),
    selected: 0,
    selectedBy: 'held-out',
    finalPass: r.finalPass === null ? null : parseLoopRecord(r.finalPass, at('finalPass')),
  };
  if (record.restarts.length === 0) throw new InputError(`${at('restarts')} must list at least one restart, got an empty list`);
  record.selected = expectInteger(r.selected, at('selected'), 0, record.restarts.length - 1);
  if (r.selectedBy !== 'held-out' && r.selectedBy !== 'training') {
    throw new InputError(`${at('selectedBy')} must be "held-out" or "training", got ${got(r.selectedBy)}`);
  }
  record.selectedBy = r.selectedBy;
  // Expected readings of a cell cannot exceed all readings of the fit (a hand-edited 1e308 would
  // overflow compare's statistics).
  const maxCount = (record.nReadings.fit + record.nReadings.heldOut) * (1 + 1e-9) + 1;
  if (r.cellReadings !== undefined) {
    if (!Array.isArray(r.cellReadings) || r.cellReadings.length !== cells) {
      throw new InputError(`${at('cellReadings')} must have one row per cell (${cells}), got ${Array.isArray(r.cellReadings) ? `${r.cellReadings.length} rows` : got(r.cellReadings)}`);
    }
    record.cellReadings = r.cellReadings.map((row: unknown, i) => {
      const w = `${at('cellReadings')}[${i}]`;
      if (!Array.isArray(row) || row.length !== surfaces) throw new InputError(`${w} must have one count per surface (${surfaces}), got ${got(row)}`);
      return row.map((v: unknown, k) => {
        const x = expectFinite(v, `${w}[${k}]`);
        if (x < 0 || x > maxCount) throw new InputError(`${w}[${k}] must be an expected count from 0 to the fit's ${Math.floor(maxCount)} readings, got ${x}`);
        return x;
      });
    });
  }
  if (r.predictiveCalibration !== undefined) {
    record.predictiveCalibration = r.predictiveCalibration === null ? null : parsePredictiveCalibration(r.predictiveCalibration, at('predictiveCalibration'));
  }
  return record;
}

/** The label-free forecast calibration table (`fit.predictiveCalibration`). */
function parsePredictiveCalibration(value: unknown, where: string): PredictiveCalibration {
  const c = expectObject(value, where);
  checkKeys(c, ['forecast', 'nReadings', 'bins', 'ece'], where);
  if (c.forecast !== 'top-reading') throw new InputError(`${where}.forecast must be "top-reading", got ${got(c.forecast)}`);
  const orNull = (v: unknown, w: string): number | null => (v === null ? null : probabilityField(v, w));
  return {
    forecast: 'top-reading',
    nReadings: expectInteger(c.nReadings, `${where}.nReadings`, 0),
    bins: expectList(c.bins, `${where}.bins`, (item, w) => {
      const b = expectObject(item, w);
      checkKeys(b, ['lower', 'upper', 'count', 'meanPredicted', 'observed'], w);
      return {
        lower: probabilityField(b.lower, `${w}.lower`),
        upper: probabilityField(b.upper, `${w}.upper`),
        count: expectInteger(b.count, `${w}.count`, 0),
        meanPredicted: orNull(b.meanPredicted, `${w}.meanPredicted`),
        observed: orNull(b.observed, `${w}.observed`),
      };
    }),
    ece: probabilityField(c.ece, `${where}.ece`),
  };
}

/** One EM loop's record (a restart or the final pass); also read back from fit checkpoints. */
export function parseLoopRecord(value: unknown, where: string): LoopRecord {
  const l = expectObject(value, where);
  checkKeys(l, LOOP_KEYS, where);
  if (!STOP_REASONS.includes(l.stopReason as StopReason)) {
    throw new InputError(`${where}.stopReason must be one of ${STOP_REASONS.map((s) => quote(s)).join(', ')}, got ${got(l.stopReason)}`);
  }
  return {
    seed: expectInteger(l.seed, `${where}.seed`, 0),
    iterations: expectInteger(l.iterations, `${where}.iterations`, 0),
    stopReason: l.stopReason as StopReason,
    history: expectList(l.history, `${where}.history`, (x, w) => expectFinite(x, w)),
    trainLogLikPerReading: expectFinite(l.trainLogLikPerReading, `${where}.trainLogLikPerReading`),
    heldOutLogLikPerReading: l.heldOutLogLikPerReading === null ? null : expectFinite(l.heldOutLogLikPerReading, `${where}.heldOutLogLikPerReading`),
    startDwell: probabilityField(l.startDwell, `${where}.startDwell`),
    ...(l.mode === undefined ? {} : { mode: transitionMode(l.mode, `${where}.mode`) }),
  };
}

function parseFitOptions(value: unknown, where: string): FitOptions {
  const o = expectObject(value, where);
  const at = (k: string): string => `${where}.${k}`;
  if (o.transitions !== 'auto') transitionMode(o.transitions, at('transitions'), ['auto']);
  const nonNegative = (k: string): number => {
    const x = expectFinite(o[k], at(k));
    if (x < 0) throw new InputError(`${at(k)} must be a number ≥ 0, got ${x}`);
    return x;
  };
  return {
    ...o,
    restarts: expectInteger(o.restarts, at('restarts'), 1),
    holdout: probabilityField(o.holdout, at('holdout')),
    holdoutCol: o.holdoutCol === null ? null : expectString(o.holdoutCol, at('holdoutCol')),
    seed: expectInteger(o.seed, at('seed'), 0),
    transitions: o.transitions as FitOptions['transitions'],
    dwell: probabilityField(o.dwell, at('dwell')),
    hit: probabilityField(o.hit, at('hit')),
    priorStrength: nonNegative('priorStrength'),
    ...(o.transitionPriorStrength === undefined ? {} : { transitionPriorStrength: nonNegative('transitionPriorStrength') }),
    maxIter: expectInteger(o.maxIter, at('maxIter'), 0),
    tol: nonNegative('tol'),
    finalPass: expectBoolean(o.finalPass, at('finalPass')),
    blockSize: expectInteger(o.blockSize, at('blockSize'), 1),
    fromDigest: o.fromDigest === null ? null : expectString(o.fromDigest, at('fromDigest')),
    ...(o.prune === undefined ? {} : { prune: nonNegative('prune') }),
  };
}

function transitionMode(v: unknown, where: string, also: string[] = []): TransitionMode {
  if (!MODES.includes(v as string)) throw new InputError(`${where} must be one of ${[...also, ...MODES].map((m) => quote(m)).join(', ')}, got ${got(v)}`);
  return v as TransitionMode;
}

function probabilityField(v: unknown, where: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v < 0 || v > 1) throw new InputError(`${where} must be a probability in [0, 1], got ${got(v)}`);
  return v;
}
