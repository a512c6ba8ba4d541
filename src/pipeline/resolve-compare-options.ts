import { InputError, quote } from '../errors.js';
import type { CompareOptions } from '../compare/compare-cells.js';
import type { FitOptions } from '../fit/fit-record.js';
import { DEFAULT_REFIT_SEARCH, type RefitSearchOptions } from '../compare/search-refit.js';
import { resolveFitOptions, type RawFitOptions } from './resolve-fit-options.js';
import { optionReader } from './option-reader.js';

/** Default number of simulated copies of the new runs that calibrate `compare`'s p-values. */
export const DEFAULT_NULL_DRAWS = 10;

/** Checked options of `compare`: the test, the warm-started re-fit, and its null draws. */
export interface ResolvedCompareOptions {
  compare: CompareOptions;
  fit: FitOptions;
  workers: number;
  /** Simulated copies of the new runs under the old model (parametric bootstrap); 0 = quick screen. */
  nullDraws: number;
  search: Omit<RefitSearchOptions, 'loop'>;
}

/**
 * Raw `compare` options (flags as strings, or a pipeline's `compare` section as JSON values, camelCase
 * keys) → checked options. The re-fit holds nothing out and has no final pass: restart 0 starts from
 * the old model. `where` and `flag` render messages as for `resolveFitOptions`.
 */
export function resolveCompareOptions(
  raw: RawFitOptions,
  where: string,
  flag: (key: string) => string = (k) => `--${k.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`,
): ResolvedCompareOptions {
  const { options, workers } = resolveFitOptions({ ...raw, transitions: raw.transitions ?? 'tied', restarts: 1, holdout: 0, finalPass: false }, where, flag);
  if (!['fixed', 'tied', 'learned'].includes(options.transitions)) {
    throw new InputError(`${where}: ${flag('transitions')} must be one of fixed, tied, learned (the re-fit keeps one mode), got ${quote(raw.transitions)}`);
  }
  delete options.transitionPriorStrength; // the re-fit's transitions have no prior
  const { num, int } = optionReader(raw, where, flag);
  return {
    compare: {
      fdr: num('fdr', 0.05, (x) => x > 0 && x < 1, 'a rate strictly between 0 and 1'),
      minReadings: num('minReadings', 100, (x) => x >= 0, 'a number ≥ 0'),
    },
    fit: options,
    workers,
    nullDraws: int('nullDraws', DEFAULT_NULL_DRAWS, 0, 1000),
    search: {
      ...DEFAULT_REFIT_SEARCH,
      robust: robustList(raw.robust, where, flag),
      swapRounds: int('swapRounds', DEFAULT_REFIT_SEARCH.swapRounds, 0, 100),
    },
  };
}

/** `--robust 0.5,0.8` (flag), `[0.5, 0.8]` (pipeline), or `none`/`[]`: the ε of each robust phase. */
function robustList(v: unknown, where: string, flag: (key: string) => string): number[] {
  if (v === undefined || v === null) return DEFAULT_REFIT_SEARCH.robust.slice();
  const items = Array.isArray(v) ? v : typeof v === 'string' ? (v.trim() === 'none' ? [] : v.split(',')) : [v];
  const list = items.map((x) => (typeof x === 'number' ? x : typeof x === 'string' && x.trim() !== '' ? Number(x) : NaN));
  if (!list.every((x) => Number.isFinite(x) && x > 0 && x < 1) || list.length > 5) {
    throw new InputError(`${where}: ${flag('robust')} must be up to 5 numbers strictly between 0 and 1 (flag: 0.5,0.8; pipeline: [0.5, 0.8]), or none, got ${quote(v)}`);
  }
  return list;
}
