import { firstDwell } from '../model/first-dwell.js';
import type { HmmModel, TransitionMode } from '../model/hmm-model.js';
import { SeededRandom } from '../model/seeded-random.js';
import { equalSplitTransitions } from '../model/equal-split-transitions.js';

/** How far restarts other than 0 stray from the survey: Dirichlet concentration of their emission rows. */
const ROW_CONCENTRATION = 12;
/** Smallest probability a drawn emission entry may take, so no reading starts impossible. */
const ROW_FLOOR = 1e-3;

/**
 * Starting parameters of restart `index`. Restart 0 is `base` itself (the survey prior, or a warm-start
 * model). Others draw each emission row from a Dirichlet centred on the base row (concentration 12,
 * entries kept ≥ 0.001), and in `tied`/`learned` mode a perturbed dwell (base dwell ± up to 0.25,
 * within [0.05, 0.95]) with the rest split equally over links.
 */
export function startingPoint(base: HmmModel, mode: TransitionMode, index: number, seed: number): { model: HmmModel; dwell: number } {
  const baseDwell = firstDwell(base);
  if (index === 0) return { model: base, dwell: baseDwell };
  const rng = new SeededRandom(seed);
  const m = base.surfaces.length;
  const n = base.cells.length;
  const emission = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let r = 0; r < m; r++) {
      const g = Math.max(ROW_FLOOR, rng.gamma(Math.max(0.05, ROW_CONCENTRATION * base.emission[i * m + r])));
      emission[i * m + r] = g;
      sum += g;
    }
    for (let r = 0; r < m; r++) emission[i * m + r] /= sum;
  }
  let trans = base.trans;
  let dwell = baseDwell;
  if (mode !== 'fixed') {
    dwell = Math.min(0.95, Math.max(0.05, baseDwell + (rng.next() - 0.5) * 0.5));
    trans = equalSplitTransitions(base.structure, dwell);
  }
  return { model: { ...base, emission, trans }, dwell };
}
