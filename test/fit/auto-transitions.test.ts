import { describe, it, expect } from 'vitest';
import { autoCandidates, shareRestarts } from '../../src/fit/auto-candidates.js';
import { selectRestart } from '../../src/fit/select-restart.js';
import { fitModel, DEFAULT_FIT_OPTIONS } from '../../src/fit/fit-model.js';
import type { LoopRecord } from '../../src/fit/fit-record.js';
import type { TransitionMode } from '../../src/model/hmm-model.js';
import { misspecifiedBuilding, MISSPECIFIED_SPECS } from '../../bench/misspecified-building.js';

const loop = (mode: TransitionMode, held: number): LoopRecord => ({
  seed: 1, iterations: 1, stopReason: 'converged', history: [-2, -1.5], trainLogLikPerReading: -1.5, heldOutLogLikPerReading: held, startDwell: 0.5, mode,
});

describe('--transitions auto: candidates and restarts', () => {
  it('considers fixed, tied, per-cell, learned; only fixed and tied when the runs carry movement columns', () => {
    expect(autoCandidates({ movement: false })).toEqual(['fixed', 'tied', 'per-cell', 'learned']);
    expect(autoCandidates({ movement: true })).toEqual(['fixed', 'tied']);
  });

  it('shares restarts out: 8 → 2 each, 5 → 2,1,1,1, 2 → at least one each, 9 → 3,2,2,2', () => {
    expect(shareRestarts(8, 4)).toEqual([2, 2, 2, 2]);
    expect(shareRestarts(5, 4)).toEqual([2, 1, 1, 1]);
    expect(shareRestarts(2, 4)).toEqual([1, 1, 1, 1]);
    expect(shareRestarts(9, 4)).toEqual([3, 2, 2, 2]);
  });

  it('the selection keeps the mode with the best held-out score, whichever mode that is (each wins once)', () => {
    const modes: TransitionMode[] = ['fixed', 'tied', 'per-cell', 'learned'];
    for (const winner of modes) {
      const restarts = modes.flatMap((m, c) => [loop(m, -1.2 - 0.01 * c), loop(m, m === winner ? -1.05 : -1.1 - 0.01 * c)]);
      expect(restarts[selectRestart(restarts, true)].mode).toBe(winner);
    }
  });
});

describe('--transitions auto end to end (invented building with per-cell dwells and unequal links)', () => {
  const b = misspecifiedBuilding({ ...MISSPECIFIED_SPECS.test, nRuns: 30, nSteps: 300 }, 5);
  const input = { floor: b.floor, runs: b.runs, floorDigest: 'x', runsDigests: [] };

  it('fits every candidate with its share of restarts and keeps the best held-out one; the objective never decreases', async () => {
    const { model, record } = await fitModel(input, { ...DEFAULT_FIT_OPTIONS, restarts: 5, maxIter: 80 }, 1);
    expect(record.options.transitions).toBe('auto');
    expect(record.restarts.map((r) => r.mode)).toEqual(['fixed', 'fixed', 'tied', 'per-cell', 'learned']);
    const best = Math.max(...record.restarts.map((r) => r.heldOutLogLikPerReading!));
    expect(record.restarts[record.selected].heldOutLogLikPerReading).toBe(best);
    expect(record.finalPass!.mode).toBe(record.restarts[record.selected].mode);
    for (const r of [...record.restarts, record.finalPass!]) {
      for (let i = 1; i < r.history.length; i++) expect(r.history[i], `${r.mode} iteration ${i}`).toBeGreaterThanOrEqual(r.history[i - 1] - 1e-9 * Math.abs(r.history[i - 1]));
    }
    // On this building (movement far from one building-wide dwell) a per-cell or learned mode wins.
    expect(['per-cell', 'learned']).toContain(record.restarts[record.selected].mode);
    // The returned model is of the chosen family: learned rows are not equal splits; per-cell dwells differ.
    const s = model.structure;
    expect(new Set(Array.from(s.dwellPos, (k) => model.trans[k].toFixed(12))).size).toBeGreaterThan(1);
  });

  it('a warm start with unequal links (--from) is brought into each candidate\'s family: no mode\'s objective decreases', async () => {
    const { record } = await fitModel({ ...input, warmStart: b.truth }, { ...DEFAULT_FIT_OPTIONS, restarts: 4, maxIter: 30 }, 1);
    expect(record.restarts.map((r) => r.mode)).toEqual(['fixed', 'tied', 'per-cell', 'learned']);
    for (const r of record.restarts) {
      for (let i = 1; i < r.history.length; i++) expect(r.history[i], `${r.mode} iteration ${i}`).toBeGreaterThanOrEqual(r.history[i - 1] - 1e-9 * Math.abs(r.history[i - 1]));
    }
  });

  it('auto gives the same model and record with 1 and 2 workers', async () => {
    const o = { ...DEFAULT_FIT_OPTIONS, restarts: 4, maxIter: 15 };
    const a = await fitModel(input, o, 1);
    const c = await fitModel(input, o, 2);
    expect(Array.from(c.model.trans)).toEqual(Array.from(a.model.trans));
    expect(Array.from(c.model.emission)).toEqual(Array.from(a.model.emission));
    expect(c.record).toEqual(a.record);
  });

  it('an explicit mode records no mode per restart and fits only that mode', async () => {
    const { record } = await fitModel(input, { ...DEFAULT_FIT_OPTIONS, transitions: 'per-cell', restarts: 2, maxIter: 40 }, 1);
    expect(record.restarts).toHaveLength(2);
    expect(record.restarts.every((r) => r.mode === undefined)).toBe(true);
  });
});
