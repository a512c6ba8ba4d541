/**
 * The survey's expectation of each cell's emission row: probability `hit` on the cell's surveyed surface
 * and `(1 − hit)` spread evenly over the other readings (all of it on the surveyed surface when the
 * alphabet has one reading). Returns cells × readings, row-major.
 */
export function surveyPrior(surfaceOfCell: Int32Array, nReadings: number, hit: number): Float64Array {
  const n = surfaceOfCell.length;
  const out = new Float64Array(n * nReadings);
  const rest = nReadings > 1 ? (1 - hit) / (nReadings - 1) : 0;
  for (let i = 0; i < n; i++) {
    for (let r = 0; r < nReadings; r++) {
      out[i * nReadings + r] = nReadings === 1 ? 1 : r === surfaceOfCell[i] ? hit : rest;
    }
  }
  return out;
}
