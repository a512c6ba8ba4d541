import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { createHash } from 'node:crypto';
import { Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import { tinyModel } from '../helpers/tiny-model.js';
import { HAS_REDIS, startRedis, type TestRedis } from '../helpers/redis-server.js';
import { packRuns } from '../../src/fit/packed-runs.js';
import { connectRedis } from '../../src/fleet/redis-connect.js';
import { queueTarget } from '../../src/fleet/queue-target.js';
import { serveBlocks } from '../../src/fleet/serve-blocks.js';
import { packRunsPayload } from '../../src/fleet/runs-payload.js';
import { packModelPayload } from '../../src/fleet/model-payload.js';
import { BLOCK_QUEUE, blockJobId, fleetKeys, type BlockJob } from '../../src/fleet/block-job.js';
import { readBlockResult } from '../../src/fleet/result-payload.js';
import { accumulateBlock } from '../../src/fit/accumulate-block.js';
import { chainFromModel } from '../../src/model/chain-from-model.js';
import { EStepWorkspace } from '../../src/fit/e-step-workspace.js';

// A worker in this process (its blocks in a thread) against a private Redis: it computes a proper job
// exactly as in-process, and refuses jobs whose payloads belong to another fit.
const digest = (s: string | Uint8Array): string => createHash('sha256').update(s).digest('hex');
const FIT = digest('this fit');
const OTHER = digest('another fit');
const model = tinyModel([0.6, 0.4], [[0.7, 0.3], [0.4, 0.6]], [[0.9, 0.1], [0.2, 0.8]], ['oak', 'tile']);
const packed = packRuns(Array.from({ length: 4 }, (_, r) => ({ id: `r${r}`, obs: Int32Array.from({ length: 30 }, (_, t) => ((t * 7 + r) % 5 < 2 ? 1 : 0)) })));

let redis: TestRedis;
let client: Redis;
let queue: Queue;

describe.skipIf(!HAS_REDIS)('serveBlocks', () => {
  beforeAll(async () => {
    redis = await startRedis();
    client = await connectRedis(queueTarget(redis.url, 'test'), 'test');
    queue = new Queue(BLOCK_QUEUE, { connection: client });
  });
  afterAll(async () => {
    await queue?.close();
    client?.disconnect();
    await redis?.stop();
  });

  it('computes a job bit for bit as in-process, and refuses runs stored for another fit and unknown job fields', async () => {
    const lines: string[] = [];
    const stop = new AbortController();
    const serving = serveBlocks(client, { concurrency: 1, stallSeconds: 5, signal: stop.signal, onLine: (l) => lines.push(l) });
    try {
      // This fit's runs and model, and one proper job.
      const runs = packRunsPayload(packed, FIT);
      await client.set(fleetKeys(FIT).runs, runs);
      await client.set(fleetKeys(FIT).model(1), packModelPayload(model, { fit: FIT, version: 1, mode: 'learned', prune: 0 }));
      const good: BlockJob = { fit: FIT, runs: digest(runs), version: 1, call: 1, kind: 'counts', block: 0, members: [0, 2, 3] };
      // A stale payload: runs packed for another fit, stored under a key the job names.
      const stale = packRunsPayload(packed, OTHER);
      const third = digest('a third fit');
      await client.set(fleetKeys(third).runs, stale);
      await client.set(fleetKeys(third).model(1), packModelPayload(model, { fit: third, version: 1, mode: 'learned', prune: 0 }));
      const foreign: BlockJob = { ...good, fit: third, runs: digest(stale) };
      const extra = { ...good, call: 2, shell: 'rm -rf /' };
      await queue.addBulk([
        { name: 'counts', data: good, opts: { jobId: blockJobId(good), removeOnComplete: true, attempts: 1 } },
        { name: 'counts', data: foreign, opts: { jobId: blockJobId(foreign), attempts: 1 } },
        { name: 'counts', data: extra, opts: { jobId: 'extra-fields', attempts: 1 } },
      ]);
      const started = Date.now();
      while (lines.length < 3 && Date.now() - started < 30_000) await new Promise((r) => setTimeout(r, 20));
      expect(lines.some((l) => l.includes('counts block 0 (3 runs)'))).toBe(true);
      const bytes = await client.getBuffer(fleetKeys(FIT).result(1, 0));
      const result = readBlockResult(bytes!, { fit: FIT, version: 1, call: 1, block: 0, kind: 'counts' }, { nCells: 2, nnz: model.structure.nnz, nReadings: 2 }, 'result');
      expect(result).toEqual(accumulateBlock(chainFromModel(model), packed, [0, 2, 3], new EStepWorkspace(), 'learned'));
      expect(lines).toContainEqual(expect.stringMatching(new RegExp(`^job ${third.slice(0, 24)} refused: fit ${third.slice(0, 12)} runs: the fit key must be this job's fit \\(${third.slice(0, 12)}…\\), got "${OTHER}"$`)));
      expect(lines).toContainEqual(expect.stringMatching(/^job extra-fields refused: job extra-fields: the job data must have only the keys .*, got \["shell"\]$/));
      expect((await queue.getJob(blockJobId(foreign)))?.failedReason).toMatch(/the fit key must be this job's fit/);
    } finally {
      stop.abort();
      await serving;
    }
  });
});
