import { describe, it, expect } from 'vitest';
import { makeScenario, SCENARIO_SIZES } from '../../bench/make-scenario.js';
import { buildModel } from '../../src/model/build-model.js';
import { parseFloor } from '../../src/io/parse-floor.js';
import type { HmmModel } from '../../src/model/hmm-model.js';
import { expectClose } from '../helpers/close.js';

// The expected values below are this scenario generator's own parameters (bench/make-scenario.ts):
// 10 × 10 grid, 50 runs × 500 steps, 2 % dropouts, dwell 0.6, hit 0.8, six readings. No published source.

/** Cells reachable from the start cells along the model's nonzero transitions (forward) or against them (backward). */
function reachable(model: HmmModel, backward: boolean): boolean[] {
  const s = model.structure;
  const n = s.nCells;
  const seen = new Array<boolean>(n).fill(false);
  const queue: number[] = [];
  for (let i = 0; i < n; i++) if (model.start[i] > 0) (seen[i] = true), queue.push(i);
  while (queue.length > 0) {
    const i = queue.pop() as number;
    const [ptr, idx] = backward ? [s.predPtr, s.predIdx] : [s.succPtr, s.succIdx];
    for (let k = ptr[i]; k < ptr[i + 1]; k++) if (!seen[idx[k]]) (seen[idx[k]] = true), queue.push(idx[k]);
  }
  return seen;
}

describe('makeScenario(size, seed)', () => {
  const a = makeScenario('small', 1);

  it('makeScenario("small", 1) twice gives identical floors, truth models and runs', () => {
    const b = makeScenario('small', 1);
    expect(b.name).toBe(a.name);
    expect(b.floor).toEqual(a.floor);
    expect(Array.from(b.truth.emission)).toEqual(Array.from(a.truth.emission));
    expect(b.runs.map((r) => r.id)).toEqual(a.runs.map((r) => r.id));
    b.runs.forEach((run, k) => expect(Array.from(run.obs), `run ${run.id}`).toEqual(Array.from(a.runs[k].obs)));
  });

  it('makeScenario("small", 2) differs from seed 1 (the seed is used)', () => {
    const c = makeScenario('small', 2);
    const same = c.runs.every((run, k) => run.obs.every((o, t) => o === a.runs[k].obs[t]));
    expect(same).toBe(false);
  });

  it('makeScenario("small", 1) has about 100 cells and 50 runs of 500 steps', () => {
    expect(a.floor.cells.length).toBeGreaterThanOrEqual(80);
    expect(a.floor.cells.length).toBeLessThanOrEqual(120);
    expect(a.truth.cells.length).toBe(a.floor.cells.length);
    expect(a.runs.length).toBe(SCENARIO_SIZES.small.nRuns);
    for (const run of a.runs) expect(run.obs.length, `run ${run.id}`).toBe(SCENARIO_SIZES.small.nSteps);
    expect(new Set(a.runs.map((r) => r.id)).size).toBe(a.runs.length);
  });

  it('every reading is one of the six surfaces (0…5) or a dropout (−1), and dropouts are about 2 %', () => {
    expect(a.floor.surfaces.length).toBe(6);
    let dropouts = 0;
    let steps = 0;
    for (const run of a.runs) {
      for (let t = 0; t < run.obs.length; t++) {
        const o = run.obs[t];
        if (!(Number.isInteger(o) && o >= -1 && o < 6)) expect.fail(`run ${run.id} step ${t}: reading ${o} out of range`);
        if (o === -1) dropouts++;
        steps++;
      }
    }
    // 25 000 steps at rate 0.02: mean 500, binomial sd ≈ 22; ±100 is more than 4 sd.
    expect(dropouts).toBeGreaterThan(400);
    expect(dropouts).toBeLessThan(600);
    expect(steps).toBe(25_000);
  });

  it('the floor is a valid underfoot-floor/1 file and every cell reaches, and is reached from, a start cell', () => {
    const parsed = parseFloor(JSON.stringify(a.floor), 'scenario.json');
    expect(parsed.cells.length).toBe(a.floor.cells.length);
    expect(parsed.cells.some((c) => c.start)).toBe(true);
    expect(reachable(a.truth, false).every(Boolean)).toBe(true);
    expect(reachable(a.truth, true).every(Boolean)).toBe(true);
  });

  it('the truth model keeps buildModel(floor, { dwell: 0.6, hit: 0.8 }) transitions and perturbs emissions around hit 0.8', () => {
    const base = buildModel(a.floor, { dwell: 0.6, hit: 0.8 });
    expect(Array.from(a.truth.trans)).toEqual(Array.from(base.trans));
    expect(Array.from(a.truth.start)).toEqual(Array.from(base.start));
    const n = a.truth.cells.length;
    const m = a.truth.surfaces.length;
    let hitSum = 0;
    let changed = 0;
    for (let i = 0; i < n; i++) {
      let row = 0;
      for (let r = 0; r < m; r++) {
        const p = a.truth.emission[i * m + r];
        expect(p).toBeGreaterThan(0);
        row += p;
        if (p !== base.emission[i * m + r]) changed++;
      }
      expectClose(row, 1, { abs: 1e-12 }, `emission row ${i}`);
      hitSum += a.truth.emission[i * m + a.truth.surfaces.indexOf(a.truth.cells[i].surface)];
    }
    expect(changed).toBe(n * m);
    // Dirichlet(40 × prior) keeps the mean 0.8; sd of one hit entry ≈ 0.062, of the mean of 100 ≈ 0.006.
    expectClose(hitSum / n, 0.8, { abs: 0.03 }, 'mean hit probability');
  });

  it('every true path starts at a start cell and moves only by dwell or along links', () => {
    const s = a.truth.structure;
    a.truePaths.forEach((path, k) => {
      expect(a.truth.start[path[0]], `run ${a.runs[k].id} start`).toBeGreaterThan(0);
      for (let t = 1; t < path.length; t++) {
        const i = path[t - 1];
        const row = Array.from(s.succIdx.subarray(s.succPtr[i], s.succPtr[i + 1]));
        if (!row.includes(path[t])) expect.fail(`run ${a.runs[k].id} step ${t}: move ${i} → ${path[t]} is not a link`);
      }
    });
  });
});
