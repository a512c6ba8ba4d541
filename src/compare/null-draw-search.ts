import type { RefitSearchOptions } from './search-refit.js';

/**
 * The re-fit search of each null draw (a copy of the new runs simulated under the old model): the
 * warm start from the old model and the swap search, without the robust and fresh starts. Under no
 * change the old model is the truth, so the warm start is where every candidate ends (measured with
 * bench/compare-fdr.ts: with nothing changed no other start reached a higher objective), and the swap
 * search costs nothing unless a row moved. This keeps `compare` within a few fits' time: the draws no
 * longer repeat the whole search. Calibration with it is measured, not assumed
 * (test/compare/refurbishment-kinds.test.ts, bench/compare-fdr.ts).
 */
export function nullDrawSearch<T extends Omit<RefitSearchOptions, 'loop'>>(search: T): T {
  return { ...search, robust: [], starts: [] };
}
