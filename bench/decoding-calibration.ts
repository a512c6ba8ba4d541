import type { HmmModel } from '../src/model/hmm-model.js';
import type { RunReadings } from '../src/fit/em-iteration.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { logChain } from '../src/decode/log-chain.js';
import { decodeRun } from '../src/decode/decode-run.js';

/** How decoding with `model` scores against the true cells (figures and tests only: needs labels). */
export interface DecodingScore {
  /** Log-likelihood per reading of the runs under the model. */
  logLikPerReading: number;
  /** Share of steps whose `likely_cell` is the true cell. */
  exact: number;
  /** Share of steps whose `likely_cell` is on the true cell's level within 1.5 m of it. */
  within15: number;
  /** Expected calibration error of `likely_p` against "likely_cell is the true cell", 10 equal bins. */
  ece: number;
  /** Per bin of likely_p: steps, mean likely_p, share right. */
  bins: Array<{ count: number; meanP: number; right: number }>;
}

/** Decodes every run with `model` and scores likely_cell / likely_p against `truePaths`. */
export function decodingCalibration(model: HmmModel, runs: RunReadings[], truePaths: Int32Array[], nBins = 10): DecodingScore {
  const chain = chainFromModel(model);
  const log = logChain(chain);
  const count = new Float64Array(nBins);
  const sumP = new Float64Array(nBins);
  const right = new Float64Array(nBins);
  let steps = 0;
  let exact = 0;
  let near = 0;
  let logLik = 0;
  let readings = 0;
  runs.forEach((run, k) => {
    const d = decodeRun(chain, log, run.obs);
    logLik += d.logLik;
    for (let t = 0; t < run.obs.length; t++) {
      if (run.obs[t] >= 0) readings++;
      const cell = d.likelyCell[t];
      const truth = truePaths[k][t];
      const p = d.likelyP[t];
      const b = Math.min(nBins - 1, Math.floor(p * nBins));
      const ok = cell === truth ? 1 : 0;
      count[b]++;
      sumP[b] += p;
      right[b] += ok;
      steps++;
      exact += ok;
      const a = model.cells[cell];
      const c = model.cells[truth];
      if (a.level === c.level && Math.hypot(a.x - c.x, a.y - c.y) <= 1.5) near++;
    }
  });
  let ece = 0;
  const bins = [];
  for (let b = 0; b < nBins; b++) {
    if (count[b] > 0) ece += (count[b] / steps) * Math.abs(sumP[b] / count[b] - right[b] / count[b]);
    bins.push({ count: count[b], meanP: count[b] ? sumP[b] / count[b] : NaN, right: count[b] ? right[b] / count[b] : NaN });
  }
  return { logLikPerReading: logLik / Math.max(1, readings), exact: exact / steps, within15: near / steps, ece, bins };
}
