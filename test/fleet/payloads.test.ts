import { describe, it, expect } from 'vitest';
import { createHash } from 'node:crypto';
import { tinyModel } from '../helpers/tiny-model.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { accumulateBlock } from '../../src/fit/accumulate-block.js';
import { scoreBlock } from '../../src/fit/score-block.js';
import { EStepWorkspace } from '../../src/fit/e-step-workspace.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { packBlob, unpackBlob } from '../../src/fleet/blob.js';
import { packRunsPayload, readRunsPayload } from '../../src/fleet/runs-payload.js';
import { packModelPayload, readModelPayload } from '../../src/fleet/model-payload.js';
import { packBlockResult, readBlockResult } from '../../src/fleet/result-payload.js';
import { checkBlockJob, type BlockJob } from '../../src/fleet/block-job.js';
import type { BlockCounts } from '../../src/fit/accumulate-block.js';

const FIT = createHash('sha256').update('fit a').digest('hex');
const OTHER = createHash('sha256').update('fit b').digest('hex');
const model = tinyModel(
  [0.5, 0.3, 0.2],
  [[0.6, 0.4, 0], [0.2, 0.5, 0.3], [0, 0.5, 0.5]],
  [[0.8, 0.1, 0.1], [0.1, 0.8, 0.1], [0.2, 0.2, 0.6]],
  ['oak', 'carpet', 'tile'],
);
const runs = Array.from({ length: 5 }, (_, r) => ({ id: `run-${r}`, obs: Int32Array.from({ length: 20 + 3 * r }, (_, t) => (t * (r + 2)) % 7 === 0 ? -1 : (t + r) % 3) }));
const packed = packRuns(runs);
const job: BlockJob = { fit: FIT, runs: 'a'.repeat(64), version: 3, call: 7, kind: 'counts', block: 1, members: [2, 3, 4] };

describe('fleet payloads', () => {
  it('packBlob/unpackBlob: arrays come back bit for bit (NaN, −0, −Infinity included)', () => {
    const f = Float64Array.of(1 / 3, -0, NaN, -Infinity, 1e-310);
    const i = Int32Array.of(-1, 0, 2 ** 31 - 1);
    const back = unpackBlob(packBlob({ note: 'x' }, [f, i]), 'test');
    expect(back.header.note).toBe('x');
    expect(new Uint8Array((back.arrays[0] as Float64Array).buffer)).toEqual(new Uint8Array(f.buffer));
    expect(back.arrays[1]).toEqual(i);
  });

  it('unpackBlob refuses a cut, padded or foreign payload with one line', () => {
    const bytes = packBlob({}, [new Float64Array(4)]);
    expect(() => unpackBlob(bytes.subarray(0, bytes.length - 8), 'test')).toThrow(/^test: the payload must be an underfoot fleet container, got arrays longer than its/);
    expect(() => unpackBlob(Buffer.concat([bytes, Buffer.alloc(8)]), 'test')).toThrow(/got 8 bytes after its arrays$/);
    expect(() => unpackBlob(Buffer.from('{"hello": 1}'), 'test')).toThrow(/without its mark$/);
  });

  it('runs: round trip, and runs packed for another fit are refused', () => {
    const bytes = packRunsPayload(packed, FIT);
    const back = readRunsPayload(bytes, FIT, 'runs');
    expect(back.packed.obs).toEqual(packed.obs);
    expect(back.packed.offsets).toEqual(packed.offsets);
    expect(back.maxCode).toBe(2);
    expect(() => readRunsPayload(bytes, OTHER, 'runs')).toThrow(/^runs: the fit key must be this job's fit \([0-9a-f]{12}…\), got "[0-9a-f]{64}"$/);
  });

  it('model: round trip gives the same kernels\' view; another fit or version is refused; bad indices are refused', () => {
    const tag = { fit: FIT, version: 3, mode: 'tied' as const, prune: 0 };
    const bytes = packModelPayload(model, tag);
    const { message, tag: back } = readModelPayload(bytes, { fit: FIT, version: 3 }, 'model');
    expect(back).toEqual(tag);
    expect(chainFromModel(message)).toEqual(chainFromModel(model));
    expect(() => readModelPayload(bytes, { fit: OTHER, version: 3 }, 'model')).toThrow(/the fit key must be this job's fit/);
    expect(() => readModelPayload(bytes, { fit: FIT, version: 4 }, 'model')).toThrow(/^model: the model version must be this job's \(4\), got 3$/);
    const bad = { ...model, structure: { ...model.structure, succIdx: model.structure.succIdx.map((j, k) => (k === 0 ? 99 : j)) } };
    expect(() => readModelPayload(packModelPayload(bad, tag), { fit: FIT, version: 3 }, 'model')).toThrow(/^model: every entry of succIdx must be from 0 to 2, got 99$/);
  });

  it('block results: counts and scores come back bit for bit; a result for another fit, version, pass or block is refused', () => {
    const ws = new EStepWorkspace();
    const chain = chainFromModel(model);
    const counts = accumulateBlock(chain, packed, [2, 3, 4], ws, 'learned');
    const tag = { fit: FIT, version: 3, call: 7, block: 1, kind: 'counts' as const };
    const dims = { nCells: 3, nnz: model.structure.nnz, nReadings: 3 };
    const back = readBlockResult(packBlockResult(counts, tag), tag, dims, 'result') as BlockCounts;
    expect(back).toEqual(counts);
    expect(Object.is(back.counts.logLik, counts.counts.logLik)).toBe(true);
    for (const key of ['fit', 'version', 'call', 'block'] as const) {
      const other = { ...tag, [key]: key === 'fit' ? OTHER : (tag[key] as number) + 1 };
      expect(() => readBlockResult(packBlockResult(counts, other), tag, dims, 'result')).toThrow(new RegExp(`^result: the result's ${key} must be this job's`));
    }
    const score = scoreBlock(chain, packed, [0, 1], ws);
    const stag = { ...tag, kind: 'score' as const };
    expect(readBlockResult(packBlockResult(score, stag), stag, dims, 'result')).toEqual(score);
  });

  it('checkBlockJob: accepts a job of this fit; refuses another fit\'s, extra keys and bad numbers', () => {
    expect(checkBlockJob(job, 'job', FIT)).toEqual(job);
    expect(() => checkBlockJob({ ...job, fit: OTHER }, 'job', FIT)).toThrow(/^job: the fit key must be this fit's \([0-9a-f]{12}…\), got "[0-9a-f]{64}"$/);
    expect(() => checkBlockJob({ ...job, code: 'process.exit(1)' }, 'job')).toThrow(/^job: the job data must have only the keys fit, runs, version, call, kind, block, members, got \["code"\]$/);
    expect(() => checkBlockJob({ ...job, members: [1, -2] }, 'job')).toThrow(/^job: every run index must be a whole number ≥ 0, got -2$/);
    expect(() => checkBlockJob({ ...job, version: 1.5 }, 'job')).toThrow(/^job: version must be a whole number ≥ 0, got 1.5$/);
    expect(() => checkBlockJob('x', 'job')).toThrow(/^job: the job data must be an object/);
  });
});
