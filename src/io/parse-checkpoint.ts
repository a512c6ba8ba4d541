import { InputError } from '../errors.js';
import { CHECKPOINT_FORMAT, type CheckpointParams, type FitCheckpoint } from '../model/fit-checkpoint-data.js';
import { checkKeys, expectFinite, expectInteger, expectList, expectObject, expectString, got } from './json-fields.js';
import { parseJsonDocument } from './parse-json-document.js';
import { parseLoopRecord } from './parse-fit-record.js';

/**
 * Reads the text of a fit checkpoint (`fit --checkpoint DIR`) and checks every field's type: a damaged
 * or hand-edited checkpoint is one line naming it. Probabilities must lie in [0, 1]; whether the lists
 * have the model's sizes and rows sum to 1 is checked by the fit, which knows the model.
 */
export function parseCheckpoint(text: string, source: string): FitCheckpoint {
  const root = expectObject(parseJsonDocument(text, source), `${source}: the checkpoint`);
  if (root.format !== CHECKPOINT_FORMAT) throw new InputError(`${source}: "format" must be "${CHECKPOINT_FORMAT}", got ${got(root.format)}`);
  checkKeys(root, ['format', 'key', 'done', 'current'], `${source}: the checkpoint`);
  const at = (k: string): string => `${source}: ${k}`;
  const done = expectList(root.done, at('done'), (item, w) => {
    const d = expectObject(item, w);
    checkKeys(d, ['record', 'params'], w);
    return { record: parseLoopRecord(d.record, `${w}.record`), params: parseParams(d.params, `${w}.params`) };
  });
  let current: FitCheckpoint['current'] = null;
  if (root.current !== null) {
    const w = at('current');
    const c = expectObject(root.current, w);
    checkKeys(c, ['phase', 'index', 'iterations', 'history', 'params'], w);
    if (c.phase !== 'restart' && c.phase !== 'final') throw new InputError(`${w}.phase must be "restart" or "final", got ${got(c.phase)}`);
    current = {
      phase: c.phase,
      index: expectInteger(c.index, `${w}.index`, 0),
      iterations: expectInteger(c.iterations, `${w}.iterations`, 0),
      history: expectList(c.history, `${w}.history`, (x, wx) => expectFinite(x, wx)),
      params: parseParams(c.params, `${w}.params`),
    };
  }
  return { format: CHECKPOINT_FORMAT, key: expectString(root.key, at('key')), done, current };
}

function parseParams(value: unknown, where: string): CheckpointParams {
  const p = expectObject(value, where);
  checkKeys(p, ['start', 'trans', 'emission', 'movement'], where);
  const probabilities = (k: 'start' | 'trans' | 'emission'): number[] =>
    expectList(p[k], `${where}.${k}`, (x, w) => {
      if (typeof x !== 'number' || !Number.isFinite(x) || x < 0 || x > 1) throw new InputError(`${w} must be a probability in [0, 1], got ${got(x)}`);
      return x;
    });
  const params: CheckpointParams = { start: probabilities('start'), trans: probabilities('trans'), emission: probabilities('emission') };
  if (p.movement !== undefined) {
    const m = expectObject(p.movement, `${where}.movement`);
    checkKeys(m, ['stayLogit', 'stayPerMetre', 'kappa'], `${where}.movement`);
    const kappa = expectFinite(m.kappa, `${where}.movement.kappa`);
    if (kappa < 0) throw new InputError(`${where}.movement.kappa must be a number ≥ 0, got ${kappa}`);
    params.movement = { stayLogit: expectFinite(m.stayLogit, `${where}.movement.stayLogit`), stayPerMetre: expectFinite(m.stayPerMetre, `${where}.movement.stayPerMetre`), kappa };
  }
  return params;
}
