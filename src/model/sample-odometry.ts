import type { HmmModel } from './hmm-model.js';
import type { SeededRandom } from './seeded-random.js';

/** Noise of simulated odometry (DEVELOPERS.md, "Movement"): documented constants, not fitted. */
export const ODOMETRY_NOISE = {
  /** Relative standard deviation of the distance of a move along a link. */
  moveRelative: 0.1,
  /** Standard deviation (metres) of the wheel jitter when the robot stays put (or rides the lift). */
  stayMetres: 0.05,
  /** Standard deviation (degrees) of the heading of a move. */
  headingDegrees: 10,
};

/**
 * Wheel odometry for a simulated walk (`cells`, one per step), as a robot would log it: at every step
 * t ≥ 1 the distance since the previous step and the heading of travel. A move along a link of planar
 * length L gives L · (1 + N(0, 0.1)) (never below 0) and its bearing + N(0, 10°); staying put, or a
 * link without a bearing (the lift), gives |N(0, 0.05 m)| and no heading (NaN). Step 0 has distance 0
 * and no heading. Draws from `rng` only (keep it apart from the walk's generator, so the same seed gives
 * the same walk with or without odometry).
 */
export function sampleOdometry(model: HmmModel, cells: Int32Array, rng: SeededRandom): { moved: Float64Array; heading: Float64Array } {
  const T = cells.length;
  const moved = new Float64Array(T);
  const heading = new Float64Array(T).fill(NaN);
  for (let t = 1; t < T; t++) {
    const a = model.cells[cells[t - 1]];
    const b = model.cells[cells[t]];
    const dx = b.x - a.x;
    const dy = b.y - a.y;
    const length = Math.hypot(dx, dy);
    if (cells[t] === cells[t - 1] || a.level !== b.level || length === 0) {
      moved[t] = Math.abs(rng.normal() * ODOMETRY_NOISE.stayMetres);
      continue;
    }
    moved[t] = Math.max(0, length * (1 + ODOMETRY_NOISE.moveRelative * rng.normal()));
    const bearing = (Math.atan2(dy, dx) * 180) / Math.PI + ODOMETRY_NOISE.headingDegrees * rng.normal();
    heading[t] = ((bearing % 360) + 360) % 360;
    if (heading[t] >= 360) heading[t] = 0;
  }
  return { moved, heading };
}
