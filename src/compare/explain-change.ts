/** What one row of the changes table says, for `explainChange`. */
export interface ExplainInput {
  /** Reading alphabet. */
  surfaces: readonly string[];
  /** The old model's row of the cell (probabilities, one per reading). */
  oldRow: ArrayLike<number>;
  /** The cell's expected readings in the new runs, one per reading. */
  newCounts: ArrayLike<number>;
  /** The region's verdict (the row's). */
  verdict: 'changed' | 'unchanged' | 'too-few-readings';
  /** The cell's own p-value (null: not tested). */
  pValue: number | null;
  region: string;
  /** Cells of the region (this one among them). */
  regionSize: number;
  fdr: number;
  minReadings: number;
}

const pct = (p: number): string => `${Math.round(100 * p)} %`;

/**
 * One plain sentence for a row of the changes table: what the cell reads now and read before (its most
 * likely reading and how often), and why it is flagged — its most likely reading changed; or it did not
 * but its whole reading table shifted (naming the reading that moved most); or its own readings show
 * little and it is flagged as one of the cells of a region the runs cannot tell apart. Unchanged and
 * untested rows get a sentence too.
 */
export function explainChange(x: ExplainInput): string {
  const m = x.surfaces.length;
  let total = 0;
  for (let r = 0; r < m; r++) total += x.newCounts[r];
  if (x.verdict === 'too-few-readings' || total <= 0) {
    return `Only ${Math.round(total)} expected readings in the new runs${x.regionSize > 1 ? ` (region ${x.region}, ${x.regionSize} cells)` : ''}, fewer than ${x.minReadings}: not tested; the runs rarely visit it.`;
  }
  const now = Array.from({ length: m }, (_, r) => x.newCounts[r] / total);
  const before = Array.from({ length: m }, (_, r) => x.oldRow[r]);
  const top = (row: number[]) => row.reduce((b, v, r) => (v > row[b] ? r : b), 0);
  const a = top(before);
  const b = top(now);
  let tv = 0;
  let most = 0;
  for (let r = 0; r < m; r++) {
    tv += Math.abs(now[r] - before[r]) / 2;
    if (Math.abs(now[r] - before[r]) > Math.abs(now[most] - before[most])) most = r;
  }
  const reads = b === a ? `Reads ${x.surfaces[b]} ${pct(now[b])} of the time (was ${pct(before[a])})` : `Reads ${x.surfaces[b]} ${pct(now[b])} of the time, was ${x.surfaces[a]} ${pct(before[a])}`;
  if (x.verdict === 'unchanged') return `${reads}: no change shown at false-discovery rate ${x.fdr}.`;
  const own = x.pValue !== null && x.pValue <= x.fdr;
  const shifted = `its most likely reading is the same, but its whole reading table shifted (${x.surfaces[most]} ${pct(now[most])} now, was ${pct(before[most])}; total variation ${tv.toFixed(2)})`;
  if (x.regionSize === 1) {
    return b === a ? `${reads}: flagged because ${shifted}.` : `${reads}: flagged, and the runs place the change on this cell.`;
  }
  const region = `region ${x.region} holds ${x.regionSize} cells that read alike and that the runs cannot tell apart, so the change could be at any of them`;
  if (x.pValue === null) return `${reads}: too few readings of its own to be tested (${Math.round(total)} expected); flagged because ${region}.`;
  if (!own) return `${reads}: its own readings alone are not conclusive; flagged because ${region}.`;
  return b === a ? `${reads}: ${shifted}; ${region}.` : `${reads}: flagged; ${region}.`;
}
