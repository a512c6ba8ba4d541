import type { HmmModel } from '../model/hmm-model.js';
import type { FitRecord } from '../model/fit-record.js';

/** Format marker of model files. */
export const MODEL_FORMAT = 'underfoot-model/1';

/** A model as stored in a model file: parameters, the building's name, and how it was fitted. */
export interface ModelFile {
  name: string;
  model: HmmModel;
  /** Null for a model that was not fitted (e.g. written by `simulate` or by hand). */
  fit: FitRecord | null;
}
