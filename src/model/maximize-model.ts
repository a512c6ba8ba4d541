import type { HmmModel, TransitionMode } from './hmm-model.js';
import type { ExpectedCountsTable } from './expected-counts-table.js';
import { learnedTransitionsMap } from './learned-transitions-map.js';
import { perCellDwellTransitions } from './per-cell-dwell-transitions.js';

export interface MaximizeOptions {
  /** How transitions are updated. @default 'tied' */
  mode?: TransitionMode;
  /** Pseudo-readings per cell behind the survey prior; 0 = plain maximum likelihood. @default 10 */
  priorStrength?: number;
  /** Survey prior rows, cells × readings (see `surveyPrior`); required when priorStrength > 0. */
  prior?: Float64Array;
  /**
   * Pseudo-transitions per cell behind the transition prior (`learned`, `per-cell`); 0 = maximum
   * likelihood. @default 0
   */
  transitionPriorStrength?: number;
  /** Centre of the transition prior, CSR order (see `equalSplitTransitions`); required when that strength > 0. */
  transitionCentre?: Float64Array;
}

/**
 * M-step of Baum-Welch (Rabiner 1989, eqs. 40a–c), maximum a posteriori for the emissions:
 *
 * - emissions: each row has a Dirichlet prior with concentrations 1 + W·prior_ir (W = priorStrength),
 *   whose mode is b_ir = (n_ir + W·prior_ir) / (Σ_r n_ir + W) — "W pseudo-readings spread as the survey
 *   expects". W = 0 is plain maximum likelihood. A row with no expected readings keeps the prior (W > 0)
 *   or its previous value (W = 0);
 * - transitions, by mode: `fixed` — unchanged; `tied` — one building-wide dwell
 *   d = Σ_i ξ_ii / Σ_i Σ_j ξ_ij over the cells that have links (the exact maximiser of
 *   D log d + L log(1 − d)), the rest split equally over each cell's links; `learned` — each row
 *   renormalised over its own nonzeros, a row with no expected transitions keeping its previous values,
 *   or with a Dirichlet prior of strength W_t centred on `transitionCentre` (`learnedTransitionsMap`);
 *   `per-cell` — each cell its own dwell under a Beta prior (`perCellDwellTransitions`);
 * - start: re-estimated from the expected start counts in `learned` mode (it stays on the cells that
 *   could start), unchanged otherwise.
 *
 * Only existing nonzeros are ever written, so transitions that are not links or dwell stay exactly zero.
 * Returns a new model; the input is not modified.
 */
export function maximizeModel(model: HmmModel, counts: ExpectedCountsTable, options: MaximizeOptions = {}): HmmModel {
  const mode = options.mode ?? 'tied';
  const w = options.priorStrength ?? 10;
  const s = model.structure;
  const n = s.nCells;
  const m = model.surfaces.length;
  if (w > 0 && (!options.prior || options.prior.length !== n * m)) {
    throw new RangeError(`maximizeModel: prior must be a ${n}×${m} table when priorStrength > 0`);
  }
  const prior = options.prior;
  const wt = options.transitionPriorStrength ?? 0;
  if (wt > 0 && (mode === 'learned' || mode === 'per-cell') && (!options.transitionCentre || options.transitionCentre.length !== s.nnz)) {
    throw new RangeError(`maximizeModel: transitionCentre must have ${s.nnz} entries when transitionPriorStrength > 0`);
  }

  // Emissions.
  const emission = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    let total = 0;
    for (let r = 0; r < m; r++) total += counts.emitT[r * n + i];
    if (w > 0 && prior) {
      const denom = total + w;
      for (let r = 0; r < m; r++) emission[i * m + r] = (counts.emitT[r * n + i] + w * prior[i * m + r]) / denom;
    } else if (total > 0) {
      for (let r = 0; r < m; r++) emission[i * m + r] = counts.emitT[r * n + i] / total;
    } else {
      for (let r = 0; r < m; r++) emission[i * m + r] = model.emission[i * m + r];
    }
  }

  // Transitions.
  let trans: Float64Array;
  if (mode === 'fixed') {
    trans = model.trans.slice();
  } else if (mode === 'tied') {
    let dwellSum = 0;
    let allSum = 0;
    for (let i = 0; i < n; i++) {
      if (s.succPtr[i + 1] - s.succPtr[i] <= 1) continue; // no links: dwell is 1 whatever d is
      for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) allSum += counts.trans[k];
      dwellSum += counts.trans[s.dwellPos[i]];
    }
    const d = allSum > 0 ? dwellSum / allSum : tiedDwell(model);
    trans = new Float64Array(s.nnz);
    for (let i = 0; i < n; i++) {
      const nLinks = s.succPtr[i + 1] - s.succPtr[i] - 1;
      for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
        trans[k] = nLinks === 0 ? 1 : k === s.dwellPos[i] ? d : (1 - d) / nLinks;
      }
    }
  } else if (mode === 'per-cell') {
    const centre = options.transitionCentre;
    trans = perCellDwellTransitions(s, counts.trans, model.trans, wt, centre ? centreDwell(model, centre) : 0);
  } else {
    trans = learnedTransitionsMap(s, counts.trans, model.trans, wt, options.transitionCentre ?? model.trans);
  }

  // Start.
  let start = model.start;
  if (mode === 'learned') {
    let total = 0;
    for (let i = 0; i < n; i++) total += counts.start[i];
    if (total > 0) start = Float64Array.from(counts.start, (c) => c / total);
  }
  return { ...model, start: start.slice(), trans, emission };
}

/** The dwell of the first cell that has links (all such cells share it in `tied` mode). */
function tiedDwell(model: HmmModel): number {
  const s = model.structure;
  for (let i = 0; i < s.nCells; i++) if (s.succPtr[i + 1] - s.succPtr[i] > 1) return model.trans[s.dwellPos[i]];
  return 1;
}

/** The centre's dwell (the same on every cell with links: the centre is an equal-split model). */
function centreDwell(model: HmmModel, centre: Float64Array): number {
  const s = model.structure;
  for (let i = 0; i < s.nCells; i++) if (s.succPtr[i + 1] - s.succPtr[i] > 1) return centre[s.dwellPos[i]];
  return 1;
}
