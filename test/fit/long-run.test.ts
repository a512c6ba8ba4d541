import { describe, it, expect } from 'vitest';
import { randomModel } from '../helpers/random-model.js';
import { expectClose } from '../helpers/close.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { emptyCounts } from '../../src/model/expected-counts-table.js';
import { sampleRun } from '../../src/model/sample-run.js';
import { SeededRandom } from '../../src/model/seeded-random.js';
import { accumulateRun } from '../../src/fit/accumulate-run.js';
import { accumulateBlock } from '../../src/fit/accumulate-block.js';
import { EStepWorkspace } from '../../src/fit/e-step-workspace.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { decodeRun } from '../../src/decode/decode-run.js';
import { logChain } from '../../src/decode/log-chain.js';

// One long run (200 000 steps, 30 cells) — the size CI can afford for the checkpointed paths that a
// 10⁶-step run takes (`npm run build && node dist/bench/long-run.js` measures that one). Oracle: the same
// E-step and decoding done in one plain pass. Invented model (seeded random).

const T = 200_000;
const model = randomModel(2024, { nCells: 30, nReadings: 6, linksPerCell: 3 });
const chain = chainFromModel(model);
const n = chain.nCells;
const obs = sampleRun(model, T, new SeededRandom(8), 0.05).obs;

describe('a long run', () => {
  it('contributes to an E-step checkpointed above the size limit, with memory within the limit, and agrees with the plain pass to 1e-12', () => {
    const plainWs = new EStepWorkspace();
    plainWs.plainLimitBytes = Infinity;
    const plain = emptyCounts(n, chain.nnz, chain.nReadings);
    accumulateRun(chain, obs, plain, plainWs);
    expect(plainWs.table.length).toBe((T + 1) * n);

    const ws = new EStepWorkspace();
    ws.plainLimitBytes = 4 * 1024 * 1024; // 4 MiB < (T + 1) · 30 · 8 bytes: checkpointed
    const counts = emptyCounts(n, chain.nnz, chain.nReadings);
    accumulateRun(chain, obs, counts, ws);
    // Segments as long as 4 MiB allows: 4 MiB / 240 bytes per row − 1 = 17 475 steps, 12 checkpoints.
    expect(ws.table.length).toBe(17_476 * n);
    expect(ws.checkpoints.length).toBe(12 * n);
    expect(ws.table.length * 8).toBeLessThanOrEqual(4 * 1024 * 1024);

    expect(Number.isFinite(counts.logLik)).toBe(true);
    expectClose(counts.logLik, plain.logLik, { rel: 1e-12 }, 'log-likelihood');
    counts.trans.forEach((v, k) => expectClose(v, plain.trans[k], { abs: 1e-12, rel: 1e-12 }, `trans ${k}`));
    counts.emitT.forEach((v, x) => expectClose(v, plain.emitT[x], { abs: 1e-12, rel: 1e-12 }, `emit ${x}`));
    // Expected transitions out of all cells sum to T − 1, readings to the non-dropout steps.
    expectClose(counts.trans.reduce((a, b) => a + b, 0), T - 1, { rel: 1e-9 }, 'Σ transitions');
    expectClose(counts.emitT.reduce((a, b) => a + b, 0), counts.nReadings, { rel: 1e-9 }, 'Σ readings');
  });

  it('goes through the lane kernels checkpointed too, next to a short run', () => {
    const short = sampleRun(model, 150_000, new SeededRandom(9), 0.05).obs;
    const packed = packRuns([
      { id: 'long', obs },
      { id: 'short', obs: short },
    ]);
    const ws = new EStepWorkspace();
    ws.plainLimitBytes = 4 * 1024 * 1024;
    const lanes = accumulateBlock(chain, packed, [0, 1], ws, 'learned').counts;
    const ref = emptyCounts(n, chain.nnz, chain.nReadings);
    const one = new EStepWorkspace();
    one.plainLimitBytes = Infinity;
    accumulateRun(chain, obs, ref, one);
    accumulateRun(chain, short, ref, one);
    expectClose(lanes.logLik, ref.logLik, { rel: 1e-12 }, 'log-likelihood');
    lanes.trans.forEach((v, k) => expectClose(v, ref.trans[k], { abs: 1e-12, rel: 1e-12 }, `trans ${k}`));
  });

  it('decodes checkpointed with the same path as the plain pass and posteriors within 1e-12', () => {
    const log = logChain(chain);
    const plain = decodeRun(chain, log, obs, { plainLimitBytes: Infinity });
    const checkpointed = decodeRun(chain, log, obs, { plainLimitBytes: 4 * 1024 * 1024 });
    expect(checkpointed.path).toEqual(plain.path);
    expectClose(checkpointed.logLik, plain.logLik, { rel: 1e-12 }, 'log P');
    expectClose(checkpointed.pathLogProb, plain.pathLogProb, { rel: 1e-12 }, 'path log P');
    let worst = 0;
    for (let t = 0; t < T; t++) worst = Math.max(worst, Math.abs(checkpointed.pathP[t] - plain.pathP[t]), Math.abs(checkpointed.entropyBits[t] - plain.entropyBits[t]));
    expect(worst).toBeLessThanOrEqual(1e-12);
  });
});
