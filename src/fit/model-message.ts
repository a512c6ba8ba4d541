import { linkBearings } from '../model/link-bearings.js';
import type { HmmModel, TransitionStructure } from '../model/hmm-model.js';

/**
 * The numeric part of a model, as sent to E-step workers. Every typed array is a view on one
 * SharedArrayBuffer, so posting it to a worker copies no numbers (structured clone shares the buffer);
 * `version` lets a worker reuse the kernels' view it built for the same model in an earlier task.
 */
export interface ModelMessage extends Pick<HmmModel, 'surfaces' | 'structure' | 'start' | 'trans' | 'emission' | 'movement'> {
  version: number;
  /** Link bearings (`linkBearings`), sent with movement parameters (the message carries no cells). */
  linkBearing?: Float64Array;
}

/** Copies the model's numbers into one SharedArrayBuffer (a few kilobytes per thousand cells). */
export function modelMessage(model: Pick<HmmModel, 'surfaces' | 'structure' | 'start' | 'trans' | 'emission' | 'movement'> & { cells?: HmmModel['cells'] }, version: number): ModelMessage {
  const s = model.structure;
  const ints = [s.succPtr, s.succIdx, s.predPtr, s.predIdx, s.predToSucc, s.dwellPos];
  const floats = [model.start, model.trans, model.emission];
  const nFloat = floats.reduce((k, a) => k + a.length, 0);
  const nInt = ints.reduce((k, a) => k + a.length, 0);
  const buffer = new SharedArrayBuffer(8 * nFloat + 4 * nInt);
  let offset = 0;
  const f64 = (a: Float64Array): Float64Array => {
    const view = new Float64Array(buffer, offset, a.length);
    view.set(a);
    offset += 8 * a.length;
    return view;
  };
  const i32 = (a: Int32Array): Int32Array => {
    const view = new Int32Array(buffer, offset, a.length);
    view.set(a);
    offset += 4 * a.length;
    return view;
  };
  const start = f64(model.start);
  const trans = f64(model.trans);
  const emission = f64(model.emission);
  const structure: TransitionStructure = {
    nCells: s.nCells,
    nnz: s.nnz,
    succPtr: i32(s.succPtr),
    succIdx: i32(s.succIdx),
    predPtr: i32(s.predPtr),
    predIdx: i32(s.predIdx),
    predToSucc: i32(s.predToSucc),
    dwellPos: i32(s.dwellPos),
  };
  const message: ModelMessage = { version, surfaces: model.surfaces, structure, start, trans, emission };
  if (model.movement) {
    message.movement = { ...model.movement };
    if (model.cells) message.linkBearing = linkBearings(s, model.cells);
  }
  return message;
}
