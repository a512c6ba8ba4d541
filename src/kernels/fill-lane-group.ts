import { LANES, type LaneGroup } from './sparse-chain.js';

/**
 * Lays up to `LANES` runs (reading codes, −1 = dropout) side by side into `group` (a new group when
 * none is given), growing its `rows` buffer only when a longer group than before arrives. Lanes beyond
 * `runs.length` are unused (length 0); every lane is padded with the dropout row up to the longest run.
 * Returns the group.
 */
export function fillLaneGroup(
  runs: ReadonlyArray<Int32Array>,
  nCells: number,
  nReadings: number,
  group: LaneGroup = { nSteps: 0, laneSteps: new Int32Array(LANES), rows: new Int32Array(0) },
): LaneGroup {
  if (runs.length > LANES) throw new RangeError(`fillLaneGroup: a group must hold at most ${LANES} runs, got ${runs.length}`);
  let nSteps = 0;
  for (const obs of runs) nSteps = Math.max(nSteps, obs.length);
  if (group.rows.length < nSteps * LANES) group.rows = new Int32Array(nSteps * LANES);
  const rows = group.rows;
  const pad = nReadings * nCells;
  for (let k = 0; k < LANES; k++) {
    const obs = k < runs.length ? runs[k] : undefined;
    const len = obs ? obs.length : 0;
    group.laneSteps[k] = len;
    for (let t = 0; t < len; t++) {
      const o = obs![t];
      rows[t * LANES + k] = (o < 0 ? nReadings : o) * nCells;
    }
    for (let t = len; t < nSteps; t++) rows[t * LANES + k] = pad;
  }
  group.nSteps = nSteps;
  return group;
}
