import type { HmmModel } from '../model/hmm-model.js';

/** Where a fresh start of `compare`'s re-fit takes its emission rows from. */
export type RefitStart = 'survey' | 'sensor';

/**
 * Emission rows of a fresh start of `compare`'s re-fit, from the old model alone (cells × readings):
 *
 * - `survey`: every cell reads its surveyed surface with probability h, the rest spread evenly, where
 *   h is the mean over cells of the old row's probability of the cell's surveyed surface (the
 *   sensor's hit rate as the old fit measured it);
 * - `sensor`: every cell takes the mean of the old rows of the cells surveyed with its surface (the
 *   old fit's sensor, surface by surface, without what it learned cell by cell).
 *
 * Cells whose surveyed surface is not a reading of the model keep their old row.
 */
export function refitStartRows(old: HmmModel, kind: RefitStart): Float64Array {
  const n = old.cells.length;
  const m = old.surfaces.length;
  const index = new Map(old.surfaces.map((s, r) => [s, r] as const));
  const surveyed = old.cells.map((c) => index.get(c.surface) ?? -1);
  const out = old.emission.slice();
  if (kind === 'survey') {
    let hit = 0;
    let k = 0;
    for (let i = 0; i < n; i++) if (surveyed[i] >= 0) {
      hit += old.emission[i * m + surveyed[i]];
      k++;
    }
    if (k === 0 || m < 2) return out;
    hit /= k;
    const rest = (1 - hit) / (m - 1);
    for (let i = 0; i < n; i++) if (surveyed[i] >= 0) for (let r = 0; r < m; r++) out[i * m + r] = r === surveyed[i] ? hit : rest;
    return out;
  }
  const sum = new Float64Array(m * m);
  const count = new Float64Array(m);
  for (let i = 0; i < n; i++) {
    const s = surveyed[i];
    if (s < 0) continue;
    count[s]++;
    for (let r = 0; r < m; r++) sum[s * m + r] += old.emission[i * m + r];
  }
  for (let i = 0; i < n; i++) {
    const s = surveyed[i];
    if (s >= 0) for (let r = 0; r < m; r++) out[i * m + r] = sum[s * m + r] / count[s];
  }
  return out;
}
