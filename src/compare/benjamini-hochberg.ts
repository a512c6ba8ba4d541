/**
 * Benjamini–Hochberg adjusted p-values (q-values) controlling the false-discovery rate (Benjamini &
 * Hochberg 1995, J. R. Stat. Soc. B 57(1)): sort p ascending, q_(i) = min_{j ≥ i} p_(j) · m / j, capped
 * at 1. A hypothesis is rejected at level α when its q ≤ α. Returns q in the input order.
 */
export function benjaminiHochberg(p: ReadonlyArray<number>): number[] {
  const m = p.length;
  const order = p.map((_, i) => i).sort((a, b) => p[a] - p[b] || a - b);
  const q = new Array<number>(m);
  let running = 1;
  for (let k = m - 1; k >= 0; k--) {
    const i = order[k];
    running = Math.min(running, (p[i] * m) / (k + 1));
    q[i] = running;
  }
  return q;
}
