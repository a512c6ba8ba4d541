/**
 * What the CLI needs from the layers below the pipeline, named in one place so that `src/cli/` imports
 * from `src/pipeline/` only (the layer rules in `.dependency-cruiser.cjs`): option defaults shown in
 * `--help`, the types of progress and results the CLI prints, and the clean-up of temporary output
 * files on exit.
 */
export { DEFAULT_THRESHOLDS } from '../decode/decode-thresholds.js';
export { DEFAULT_REFIT_SEARCH } from '../compare/search-refit.js';
export { DEFAULT_AMBIGUITY_OPTIONS, type AmbiguityOptions } from '../report/estimate-ambiguity.js';
export type { FitProgress } from '../fit/fit-model.js';
export type { ModelFile } from '../io/model-file.js';
export { removeTemporaryFiles } from './temporary-files.js';
export { SAFETY_CAUTION } from './decode-from-files.js';
export type { QueueWait } from './queue-engine-for.js';
