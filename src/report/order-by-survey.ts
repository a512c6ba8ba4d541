import type { HmmModel } from '../model/hmm-model.js';

/**
 * Cell indices grouped by surveyed surface (in the alphabet's order), and within a group by the
 * probability of reading the surveyed surface, highest first (ties by cell order): the cells that read
 * least like their survey close each group.
 */
export function orderBySurvey(model: HmmModel): number[] {
  const m = model.surfaces.length;
  const surfaceIndex = new Map(model.surfaces.map((s, r) => [s, r] as const));
  const surveyed = model.cells.map((c) => surfaceIndex.get(c.surface) ?? 0);
  return model.cells
    .map((_, i) => i)
    .sort((a, b) => surveyed[a] - surveyed[b] || model.emission[b * m + surveyed[b]] - model.emission[a * m + surveyed[a]] || a - b);
}
