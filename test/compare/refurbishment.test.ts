import { describe, it, expect } from 'vitest';
import { searchRefit, DEFAULT_REFIT_SEARCH, type RefitSearchOptions } from '../../src/compare/search-refit.js';
import { compareCells } from '../../src/compare/compare-cells.js';
import { drawNullRuns } from '../../src/compare/draw-null-runs.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { LocalEngine } from '../../src/fit/local-engine.js';
import { refurbishedGrid, calibrateOld, blocksOf } from './refurbished-grid.js';

/**
 * `compare`'s whole procedure (search re-fit, expected readings, null draws, G, F reference,
 * regions, Benjamini–Hochberg over regions at 0.05) on invented refurbishments of an invented 6 × 5
 * floor: 3 of 30 cells change surface, 40 new runs of 300 steps. Counted by reported region: a false
 * discovery is a reported region holding no changed cell; a changed cell is found when it lies in a
 * reported region. The seeds are 1–4, fixed in advance (not picked).
 * Measured with bench/compare-fdr.ts (FLOOR=random, 8 seeds, 5 null draws): mean false-discovery
 * proportion 0.063, every changed cell with ≥ 300 expected readings found, nothing flagged without
 * change. The bounds here are generous: 4 trials are few.
 */
async function compareTrial(seed: number, nChanged: number, nullDraws: number) {
  const s = refurbishedGrid(seed, nChanged);
  const { model: old, countsT: oldCounts } = await calibrateOld(s);
  const loop: RefitSearchOptions['loop'] = { mode: 'fixed', priorStrength: 10, prior: old.emission, maxIter: 200, tol: 1e-6 };
  const refitCounts = async (runs: Array<{ id: string; obs: Int32Array }>): Promise<Float64Array> => {
    const packed = packRuns(runs);
    const engine = new LocalEngine(packed, { mode: 'fixed' });
    const found = await searchRefit(engine, packed, blocksOf(runs.length), old, { ...DEFAULT_REFIT_SEARCH, loop });
    return found.counts.emitT;
  };
  const observed = await refitCounts(s.newRuns);
  const draws: Float64Array[] = [];
  for (let b = 1; b <= nullDraws; b++) draws.push(await refitCounts(drawNullRuns(old, s.newRuns, 1000 * seed + b)));
  const res = compareCells(old, oldCounts, observed, { fdr: 0.05, minReadings: 100, oldPriorStrength: 10 }, draws);
  const index = new Map(s.floor.cells.map((c, i) => [c.id, i] as const));
  // By region (what is reported): a false discovery is a reported region holding no changed cell.
  const reported = res.regions.filter((r) => r.verdict === 'changed');
  const falseFlags = reported.filter((r) => !r.cells.some((id) => s.changed.has(index.get(id)!))).length;
  const extraCells = reported.reduce((sum, r) => sum + r.cells.filter((id) => !s.changed.has(index.get(id)!)).length, 0);
  const missed = res.changes.filter((c) => s.changed.has(index.get(c.cell)!) && c.expectedReadings >= 300 && c.verdict !== 'changed').map((c) => c.cell);
  return { fdp: falseFlags / Math.max(1, reported.length), falseFlags, missed, extraCells, reported: reported.length };
}

describe('compare on simulated refurbishments (the whole procedure)', () => {
  it('finds every changed cell with ≥ 300 expected readings; false discoveries stay near the nominal rate', async () => {
    let fdp = 0;
    let extra = 0;
    let reported = 0;
    for (const seed of [1, 2, 3, 4]) {
      const t = await compareTrial(seed, 3, 3);
      expect(t.missed, `seed ${seed}`).toEqual([]);
      fdp += t.fdp;
      extra += t.extraCells;
      reported += t.reported;
    }
    expect(fdp / 4).toBeLessThanOrEqual(0.2);
    // Regions hold few cells beyond the changed ones (a region must not be the whole building).
    expect(extra / Math.max(1, reported)).toBeLessThanOrEqual(3);
  }, 300_000);

  it('flags (almost) nothing when nothing changed', async () => {
    let falseFlags = 0;
    for (const seed of [1, 2]) falseFlags += (await compareTrial(seed, 0, 3)).falseFlags;
    expect(falseFlags).toBeLessThanOrEqual(1);
  }, 300_000);
});
