import { buildModel } from '../../src/model/build-model.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import type { HmmModel } from '../../src/model/hmm-model.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { LocalEngine } from '../../src/fit/local-engine.js';
import { runEm } from '../../src/fit/em-loop.js';
import { toBlocks } from '../../src/fit/to-blocks.js';
import { gridFloor } from '../helpers/grid-floor.js';

/**
 * An invented refurbishment on an invented 6 × 5 floor with five surfaces laid at random (seeded):
 * true rows drawn around each cell's surface, an old model calibrated by EM on 40 runs of 300 steps,
 * then `changed` cells given another surface and 40 new runs drawn. For tests of `compare`.
 */
export function refurbishedGrid(seed: number, changed: number) {
  const surfaces = ['oak', 'carpet', 'tile', 'rubber', 'concrete'];
  const layout = new SeededRandom(77);
  const floor = gridFloor(6, 5, surfaces, () => layout.int(5), 'refurbished test grid');
  const m = surfaces.length;
  const n = floor.cells.length;
  const truth = buildModel(floor, { dwell: 0.6, hit: 0.85 });
  const rng = new SeededRandom(seed);
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let r = 0; r < m; r++) sum += truth.emission[i * m + r] = rng.gamma(200 * truth.emission[i * m + r]);
    for (let r = 0; r < m; r++) truth.emission[i * m + r] /= sum;
  }
  const cells = new Set<number>();
  while (cells.size < changed) cells.add(rng.int(n));
  const after: HmmModel = { ...truth, emission: truth.emission.slice() };
  for (const i of cells) {
    const from = surfaces.indexOf(floor.cells[i].surface);
    const to = (from + 1 + rng.int(m - 1)) % m;
    for (let r = 0; r < m; r++) after.emission[i * m + r] = r === to ? 0.85 : 0.0375;
  }
  const runs = (model: HmmModel, s: number) => {
    const r = new SeededRandom(s);
    return Array.from({ length: 40 }, (_, k) => ({ id: `r${k}`, obs: sampleRun(model, 300, r, 0.02).obs }));
  };
  return { floor, truth, after, changed: cells, oldRuns: runs(truth, seed + 1), newRuns: runs(after, seed + 2), surfaces };
}

/** Blocks of 8 runs, in order. */
export function blocksOf(nRuns: number): number[][] {
  return toBlocks(Array.from({ length: nRuns }, (_, r) => r), 8);
}

/** The old model: EM from the survey prior on the old runs (fixed transitions), and its expected readings (readings × cells). */
export async function calibrateOld(s: ReturnType<typeof refurbishedGrid>) {
  const start = buildModel(s.floor, { dwell: 0.6, hit: 0.85 });
  const packed = packRuns(s.oldRuns);
  const engine = new LocalEngine(packed, { mode: 'fixed' });
  const blocks = blocksOf(s.oldRuns.length);
  const res = await runEm(engine, packed, start, blocks, { mode: 'fixed', priorStrength: 10, prior: start.emission.slice(), maxIter: 300, tol: 1e-8 });
  return { model: res.model, countsT: res.counts.emitT };
}
