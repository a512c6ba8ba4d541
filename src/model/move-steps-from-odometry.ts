import { distanceBin, headingBin, type MoveSteps } from '../kernels/move-chain.js';

/**
 * The kernels' odometry bins of one run (`MoveSteps`) from its distances (metres) and headings
 * (degrees) per step, NaN = unknown: distances rounded to the centimetre (20 m and more share the last
 * bin), headings to 5° bins. Entry 0 is always unknown.
 */
export function moveStepsFromOdometry(moved: Float64Array, heading: Float64Array): MoveSteps {
  const T = moved.length;
  const dBin = new Int32Array(T).fill(-1);
  const hBin = new Int32Array(T).fill(-1);
  for (let t = 1; t < T; t++) {
    if (!Number.isNaN(moved[t])) dBin[t] = distanceBin(moved[t]);
    if (!Number.isNaN(heading[t])) hBin[t] = headingBin(heading[t]);
  }
  return { dBin, hBin };
}
