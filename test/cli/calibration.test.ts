import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { formatModel } from '../../src/io/format-model.js';
import { parseModel } from '../../src/io/parse-model.js';
import { parseCsv } from '../../src/io/parse-csv.js';
import { misspecifiedBuilding, MISSPECIFIED_SPECS } from '../../bench/misspecified-building.js';

// An invented two-level building whose true movement has its own dwell per cell (0.35–0.85) and
// unequal link weights: fixed and tied fits are misspecified; the truth is known.
const b = misspecifiedBuilding(MISSPECIFIED_SPECS.test, 7);
const tmp = tempDir();
const p = tmp.path;

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(b.floor));
  writeFileSync(p('truth.json'), formatModel({ name: 'truth', model: b.truth, fit: null }));
  for (const [file, runs, seed] of [['runs.csv', '110', '21'], ['test.csv', '40', '22']]) {
    const sim = runCli(['simulate', '--floor', p('floor.json'), '--model', p('truth.json'), '--runs', runs, '--steps', '500', '--seed', seed, '--dropout-rate', '0.02', '--out', p(file), '-q']);
    expect(sim.code, sim.stderr).toBe(0);
  }
});
afterAll(() => tmp.remove());

/** ECE of likely_p against "likely_cell is true_cell" (10 equal bins) and exact-cell accuracy. */
function scoreAnnotated(csv: string): { ece: number; exact: number } {
  const t = parseCsv(csv, 'annotated.csv');
  const col = (name: string) => t.columns[t.header.indexOf(name)];
  const [truth, cell, prob] = [col('true_cell'), col('likely_cell'), col('likely_p')];
  const n = new Float64Array(10);
  const sumP = new Float64Array(10);
  const right = new Float64Array(10);
  let exact = 0;
  for (let r = 0; r < t.nRows; r++) {
    const pr = Number(prob.get(r));
    const bin = Math.min(9, Math.floor(pr * 10));
    const ok = truth.get(r) === cell.get(r) ? 1 : 0;
    n[bin]++;
    sumP[bin] += pr;
    right[bin] += ok;
    exact += ok;
  }
  let ece = 0;
  for (let k = 0; k < 10; k++) if (n[k] > 0) ece += (n[k] / t.nRows) * Math.abs(sumP[k] / n[k] - right[k] / n[k]);
  return { ece, exact: exact / t.nRows };
}

describe('calibration on a building the default movement model does not describe', () => {
  // Issue 18 asks for ECE ≤ 0.04 (met: 0.027 measured) and exact-cell accuracy within 2 points of the
  // true model's — NOT met: 0.626 vs 0.646 measured, 2.0 points (2.7 before `per-cell`/`learned` ran
  // to the projected convergence rule, em-converged.ts). The rest is estimation error at this data
  // size, not where EM stops or a local optimum: a fit started from the true model and run to 1e-9
  // ends at the same point (DEVELOPERS.md, "Calibration"). The test holds 2.5 points so that a
  // regression shows.
  it('with the default options likely_p is calibrated (ECE ≤ 0.04) and exact-cell accuracy is within 2.5 points of the true model', () => {
    const fit = runCli(['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('model.json'), '--workers', '1']);
    expect(fit.code, fit.stderr).toBe(0);
    expect(fit.stdout).toMatch(/forecast calibration on the held-out runs/);
    for (const [model, out] of [['model.json', 'fitted.csv'], ['truth.json', 'true.csv']]) {
      const d = runCli(['decode', '--model', p(model), '--runs', p('test.csv'), '--out', p(out)]);
      expect(d.code, d.stderr).toBe(0);
    }
    const fitted = scoreAnnotated(readFileSync(p('fitted.csv'), 'utf8'));
    const truth = scoreAnnotated(readFileSync(p('true.csv'), 'utf8'));
    // eslint-disable-next-line no-console
    console.log(`likely_p ECE ${fitted.ece.toFixed(4)} (true model ${truth.ece.toFixed(4)}); exact ${fitted.exact.toFixed(4)} vs ${truth.exact.toFixed(4)}`);
    expect(fitted.ece).toBeLessThanOrEqual(0.04);
    expect(fitted.exact).toBeGreaterThanOrEqual(truth.exact - 0.025);
  }, 600_000);

  it('learned (with its prior) no longer loses held-out likelihood to tied on the same data', () => {
    const record = parseModel(readFileSync(p('model.json'), 'utf8'), 'model.json').fit!;
    const best = (mode: string) => Math.max(...record.restarts.filter((r) => r.mode === mode).map((r) => r.heldOutLogLikPerReading!));
    expect(best('learned')).toBeGreaterThanOrEqual(best('tied'));
    // The fit's label-free check is recorded for the chosen restart.
    expect(record.predictiveCalibration!.nReadings).toBe(record.nReadings.heldOut);
  });
});
