import { describe, it, expect } from 'vitest';
import { benchBuilding, refurbishmentTrial, decodeShare, REFURBISHMENT_KINDS, type BenchFloor } from '../../bench/refurbishment-trial.js';

/**
 * `compare`'s whole procedure (re-fit search, 10 null draws, per-cell and per-region tests,
 * Benjamini–Hochberg over regions at 0.05, the cells `--write-floor` writes) on the benchmark's
 * refurbishments (bench/refurbishment-trial.ts): a whole room re-floored, a corridor stretch of 3 cells,
 * one worn cell and nothing changed, on the `offices` floor (rooms of one surface, a corridor of
 * repeating surfaces, zones, docks) and the `stripes` floor (every reading fits many places). Seeds
 * fixed in advance: 101 + 7k, as bench/compare-fdr.ts.
 */
const seeds = (count: number) => Array.from({ length: count }, (_, k) => 101 + 7 * k);

// Mean FDP by region (over trials that report something): the change's target, ≤ 0.1 at a nominal
// 0.05, over the whole benchmark (both floors, every kind, seeds 101, 108, 115). Measured
// (bench/compare-fdr.ts 3 10): stripes 0 in every kind; offices 0.15 — all of it from one old model
// (seed 115), where the region of the dock at the corridor's end and its look-alike two cells away is
// reported in the `room` and `none` trials (q 0.02–0.05); so offices alone is held to that measurement
// (≤ 0.2), not to the target (DEVELOPERS.md, "compare", known limits).
const fdpBound: Record<BenchFloor, number> = { stripes: 0.1, offices: 0.2 };
const pooled = { fdp: 0, withReport: 0 };

describe('compare on the benchmark\'s refurbishments (whole procedure, 10 null draws)', () => {
  for (const layout of ['offices', 'stripes'] as BenchFloor[]) {
    const building = benchBuilding(layout);
    it(`${layout}: every changed cell with ≥ 300 expected readings inside a reported region; --write-floor writes only changed cells; mean FDP by region ≤ ${fdpBound[layout]}; the re-fit decodes as well as the true new model`, async () => {
      let fdp = 0;
      let withReport = 0;
      let nearRefit = 0;
      let nearTrue = 0;
      let zoneRefit = 0;
      let zoneTrue = 0;
      let trials = 0;
      for (const kind of REFURBISHMENT_KINDS) {
        for (const seed of seeds(3)) {
          const t = await refurbishmentTrial(building, seed, kind, { nullDraws: 10 });
          if (t.reported) {
            withReport++;
            fdp += t.falseRegions / t.reported;
          }
          expect(t.found, `${kind} seed ${seed}: changed cells with ≥ 300 expected readings in a reported region`).toBe(t.testable);
          expect(t.writtenUnchanged, `${kind} seed ${seed}: unchanged cells written`).toEqual([]);
          expect(t.writtenWrongSurface, `${kind} seed ${seed}: changed cells written with a wrong surface`).toEqual([]);
          const r = decodeShare(building.floor, t.refit, t.newRuns);
          const tr = decodeShare(building.floor, t.after, t.newRuns);
          nearRefit += r.near;
          nearTrue += tr.near;
          zoneRefit += r.zone;
          zoneTrue += tr.zone;
          trials++;
        }
      }
      pooled.fdp += fdp;
      pooled.withReport += withReport;
      expect(withReport ? fdp / withReport : 0).toBeLessThanOrEqual(fdpBound[layout]);
      // Item 3 of the change: within 1.5 m and by zone, the re-fit decodes the new runs about as well as
      // the true new model (mean over the 12 trials; 3 points of slack for their noise).
      expect(nearRefit / trials).toBeGreaterThanOrEqual(nearTrue / trials - 0.03);
      expect(zoneRefit / trials).toBeGreaterThanOrEqual(zoneTrue / trials - 0.03);
    }, 2_400_000);
  }
  it('over the whole benchmark: mean FDP by region ≤ 0.1 at a nominal 0.05', () => {
    expect(pooled.withReport).toBeGreaterThan(0);
    expect(pooled.fdp / pooled.withReport).toBeLessThanOrEqual(0.1);
  });
});

describe('a whole room re-floored', () => {
  it('is reported as one region whose candidates are that room\'s cells (offices floor, every office)', async () => {
    const building = benchBuilding('offices');
    for (const seed of seeds(3)) {
      const t = await refurbishmentTrial(building, seed, 'room', { nullDraws: 10 });
      const ids = [...t.changed].map((i) => building.floor.cells[i].id).sort();
      const holding = t.comparison.regions.filter((r) => r.verdict === 'changed' && r.cells.some((c) => ids.includes(c)));
      expect(holding, `seed ${seed}`).toHaveLength(1);
      expect([...holding[0].cells].sort(), `seed ${seed}`).toEqual(ids);
      for (const c of t.comparison.changes.filter((row) => ids.includes(row.cell))) expect([...c.candidates].sort()).toEqual(ids);
    }
  }, 2_400_000);
});
