import type { DecodedRun } from './decode-run.js';
import type { DecodeThresholds } from './decode-thresholds.js';

/** One run's row of the run summary (docs/formats.md, "Run summary"), less its id and split. */
export interface RunSummary {
  steps: number;
  dropouts: number;
  loglik: number;
  loglikPerReading: number;
  pathLogprob: number;
  meanPathP: number;
  lowConfidenceSteps: number;
  surprisingSteps: number;
}

/** Per-step flags as a bit set: 1 dropout, 2 low-confidence, 4 surprising, 8 impossible. */
export const FLAG_DROPOUT = 1;
export const FLAG_LOW_CONFIDENCE = 2;
export const FLAG_SURPRISING = 4;
export const FLAG_IMPOSSIBLE = 8;

/** Flags each step (into `flagsOut`) and summarises the run. */
export function summarizeRun(obs: Int32Array, dec: DecodedRun, th: DecodeThresholds, flagsOut: Uint8Array): RunSummary {
  const T = obs.length;
  let dropouts = 0;
  let low = 0;
  let surprising = 0;
  let sumP = 0;
  const impossible = dec.logLik === -Infinity;
  for (let t = 0; t < T; t++) {
    let f = 0;
    if (obs[t] < 0) {
      f |= FLAG_DROPOUT;
      dropouts++;
    }
    if (impossible) f |= FLAG_IMPOSSIBLE;
    else {
      sumP += dec.pathP[t];
      if (dec.pathP[t] < th.lowConfidence) {
        f |= FLAG_LOW_CONFIDENCE;
        low++;
      }
      if (dec.surpriseBits[t] > th.surprisingBits) {
        f |= FLAG_SURPRISING;
        surprising++;
      }
    }
    flagsOut[t] = f;
  }
  const nReadings = T - dropouts;
  return {
    steps: T,
    dropouts,
    // A run of only dropouts has probability 1 exactly; the scaled sums give 1 ± rounding.
    loglik: nReadings === 0 && !impossible ? 0 : dec.logLik,
    loglikPerReading: nReadings > 0 ? dec.logLik / nReadings : NaN,
    pathLogprob: dec.pathLogProb,
    meanPathP: impossible || T === 0 ? NaN : sumP / T,
    lowConfidenceSteps: low,
    surprisingSteps: surprising,
  };
}

/** The `flag` column's text for a flag bit set: names joined by `+`, empty for none. */
export function flagText(f: number): string {
  if (f === 0) return '';
  const parts: string[] = [];
  if (f & FLAG_DROPOUT) parts.push('dropout');
  if (f & FLAG_IMPOSSIBLE) parts.push('impossible');
  if (f & FLAG_LOW_CONFIDENCE) parts.push('low-confidence');
  if (f & FLAG_SURPRISING) parts.push('surprising');
  return parts.join('+');
}
