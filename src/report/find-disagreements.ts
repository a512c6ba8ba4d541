import type { HmmModel } from '../model/hmm-model.js';
import type { Disagreement } from './report-data.js';

/**
 * Cells whose most likely reading (largest emission probability; ties go to the surveyed surface) is
 * not their surveyed surface, most confident disagreement first.
 */
export function findDisagreements(model: HmmModel): Disagreement[] {
  const m = model.surfaces.length;
  const surfaceIndex = new Map(model.surfaces.map((s, r) => [s, r] as const));
  const out: Disagreement[] = [];
  model.cells.forEach((c, i) => {
    const surveyed = surfaceIndex.get(c.surface) ?? 0;
    let best = surveyed;
    for (let r = 0; r < m; r++) if (model.emission[i * m + r] > model.emission[i * m + best]) best = r;
    if (best !== surveyed) out.push({ cell: i, likely: best, likelyP: model.emission[i * m + best], surveyedP: model.emission[i * m + surveyed] });
  });
  return out.sort((a, b) => b.likelyP - b.surveyedP - (a.likelyP - a.surveyedP) || a.cell - b.cell);
}
