/**
 * The likelihood-ratio (G) statistic of a 2 × M table — counts of the same M readings in two samples —
 * for homogeneity (Sokal & Rohlf, "Biometry", G-test of independence in an R × C table):
 * G = 2 Σ_k Σ_r O_kr ln(O_kr / E_kr), E_kr = (row total k)(column total r) / grand total. Counts may be
 * fractional. Returns G and the degrees of freedom, (non-empty columns − 1), at least 1.
 */
export function gHomogeneity(a: ArrayLike<number>, b: ArrayLike<number>): { g: number; df: number } {
  let ta = 0;
  let tb = 0;
  let columns = 0;
  for (let r = 0; r < a.length; r++) {
    ta += a[r];
    tb += b[r];
    if (a[r] + b[r] > 0) columns++;
  }
  const total = ta + tb;
  if (!(ta > 0) || !(tb > 0)) return { g: 0, df: Math.max(1, columns - 1) };
  let g = 0;
  for (let r = 0; r < a.length; r++) {
    const col = a[r] + b[r];
    if (a[r] > 0) g += a[r] * Math.log((a[r] * total) / (ta * col));
    if (b[r] > 0) g += b[r] * Math.log((b[r] * total) / (tb * col));
  }
  return { g: Math.max(0, 2 * g), df: Math.max(1, columns - 1) };
}
