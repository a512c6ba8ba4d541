/**
 * [min, max] of the finite values, widened by `pad` of the span on each side (by a small absolute
 * amount when all values are equal), so points do not sit on the frame. [0, 1] when there are none.
 */
export function paddedExtent(values: Iterable<number>, pad = 0.08): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo === Infinity) return [0, 1];
  const span = hi - lo;
  const d = span > 0 ? span * pad : Math.max(Math.abs(lo) * 0.01, 1e-3);
  return [lo - d, hi + d];
}
