import type { HmmModel } from '../model/hmm-model.js';

/** The numeric part of a model, as sent to E-step workers (structured-clone friendly). */
export type ModelMessage = Pick<HmmModel, 'surfaces' | 'structure' | 'start' | 'trans' | 'emission'>;

export function modelMessage(model: HmmModel): ModelMessage {
  return { surfaces: model.surfaces, structure: model.structure, start: model.start, trans: model.trans, emission: model.emission };
}
