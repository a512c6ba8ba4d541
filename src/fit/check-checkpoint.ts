import { InputError } from '../errors.js';
import type { HmmModel } from '../model/hmm-model.js';
import type { CheckpointParams, FitCheckpoint } from './fit-checkpoint.js';

/** Rows of a checkpoint's probabilities must sum to 1 within this (they are written with full precision). */
const SUM_TOLERANCE = 1e-9;

/**
 * Checks a loaded checkpoint (already checked for types by its reader) against the fit it is to resume:
 * list sizes match the model, every start, transition and emission row sums to 1, restart indices and
 * iteration counts lie within the options. A checkpoint that fails is one InputError naming `where`.
 */
export function checkCheckpoint(saved: FitCheckpoint, model: HmmModel, restarts: number, maxIter: number, where: string): void {
  const fail = (what: string): never => {
    throw new InputError(`${where}: ${what}; remove the checkpoint to start the fit afresh`);
  };
  if (saved.done.length > restarts) fail(`"done" must hold at most ${restarts} finished restarts, got ${saved.done.length}`);
  saved.done.forEach((d, k) => {
    checkParams(d.params, model, `done[${k}].params`, fail);
    if (d.record.iterations > maxIter) fail(`done[${k}].record.iterations must be at most ${maxIter}, got ${d.record.iterations}`);
  });
  const c = saved.current;
  if (c) {
    if (c.phase === 'restart' && c.index !== saved.done.length) fail(`current.index must be the next restart (${saved.done.length}), got ${c.index}`);
    if (c.phase === 'final' && (saved.done.length !== restarts || c.index >= restarts)) {
      fail(`current (the final pass) must follow all ${restarts} restarts and name one of them, got ${saved.done.length} done and index ${c.index}`);
    }
    if (c.iterations > maxIter) fail(`current.iterations must be at most ${maxIter}, got ${c.iterations}`);
    if (c.history.length !== c.iterations) fail(`current.history must hold one objective per iteration (${c.iterations}), got ${c.history.length}`);
    checkParams(c.params, model, 'current.params', fail);
  }
}

function checkParams(p: CheckpointParams, model: HmmModel, where: string, fail: (what: string) => never): void {
  const n = model.cells.length;
  const m = model.surfaces.length;
  const s = model.structure;
  const sizes: Array<['start' | 'trans' | 'emission', number]> = [['start', n], ['trans', s.nnz], ['emission', n * m]];
  for (const [k, size] of sizes) if (p[k].length !== size) fail(`${where}.${k} must hold ${size} numbers for this floor, got ${p[k].length}`);
  const sumOf = (values: number[], from: number, to: number): number => {
    let sum = 0;
    for (let k = from; k < to; k++) sum += values[k];
    return sum;
  };
  const check = (sum: number, what: string): void => {
    if (!(Math.abs(sum - 1) <= SUM_TOLERANCE)) fail(`${where}.${what} must sum to 1, got ${sum}`);
  };
  if ((p.movement !== undefined) !== (model.movement !== undefined)) {
    fail(`${where}.movement must ${model.movement ? 'be present (this fit uses odometry)' : 'be absent (this fit uses no odometry)'}, got ${p.movement ? 'movement parameters' : 'none'}`);
  }
  check(sumOf(p.start, 0, n), 'start');
  for (let i = 0; i < n; i++) {
    check(sumOf(p.trans, s.succPtr[i], s.succPtr[i + 1]), `trans (row of cell ${JSON.stringify(model.cells[i].id)})`);
    check(sumOf(p.emission, i * m, (i + 1) * m), `emission (row of cell ${JSON.stringify(model.cells[i].id)})`);
  }
}
