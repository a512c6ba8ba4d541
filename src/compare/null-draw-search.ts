import type { RefitSearchOptions } from './search-refit.js';

/**
 * The re-fit search of each null draw (a copy of the new runs simulated under the old model): the
 * warm start from the old model and the swap search, without the robust and fresh starts. Under no
 * change the old model is the truth and the warm start is where the other starts end too, and the swap
 * search costs nothing unless a row moved. So the draws no longer repeat the whole search. Measured with
 * bench/compare-fdr.ts (`NULL_SEARCH=full` runs the whole search on every draw): the same reported and
 * false regions on the `offices` floor's seeds 101–115 (`room`, `none`) at a quarter to a third of the
 * cost. Calibration with it: test/compare/refurbishment-kinds.test.ts, refurbishment-none.test.ts.
 */
export function nullDrawSearch<T extends Omit<RefitSearchOptions, 'loop'>>(search: T): T {
  return { ...search, robust: [], starts: [] };
}
