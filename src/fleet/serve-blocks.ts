import { createHash } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { Worker, UnrecoverableError, type Job } from 'bullmq';
import { Piscina } from 'piscina';
import type { Redis } from 'ioredis';
import { WorkError } from '../errors.js';
import type { PackedRuns } from '../fit/packed-runs.js';
import type { ModelMessage } from '../fit/model-message.js';
import type { ModelTag } from './model-payload.js';
import { readModelPayload } from './model-payload.js';
import { readRunsPayload, type FleetRuns } from './runs-payload.js';
import { BLOCK_QUEUE, checkBlockJob, fleetKeys, type BlockJob } from './block-job.js';
import type { ThreadTask } from './block-thread.js';

export interface ServeOptions {
  /** Blocks computed at once (threads). */
  concurrency: number;
  /**
   * Seconds a job's lock lasts without renewal (renewed every half of it while the block runs); a job
   * whose worker died is handed to another worker after at most about twice this (BullMQ's stalled-job
   * check runs every `stallSeconds` in every worker).
   */
  stallSeconds: number;
  /** Stops the worker: blocks being computed are finished first. */
  signal?: AbortSignal;
  /** One line per block done or refused, and per connection trouble (the CLI prints them). */
  onLine?: (line: string) => void;
}

/** Results stay in Redis at most this long when no coordinator collects them. */
const RESULT_TTL_MS = 3_600_000;
/** Each job may be handed out again this often after its worker died. */
const MAX_STALLED = 5;

/**
 * `underfoot worker`: takes block jobs from the queue (`BLOCK_QUEUE`) until stopped. For each job it
 * checks the job's data (`checkBlockJob`), reads the fit's runs once per fit and each model version
 * once (both checked: the runs' SHA-256 against the job, the payloads' fit key and version, sizes and
 * ranges), computes the block in a thread (`block-thread.ts`), stores the result under the fit's keys
 * and completes the job. A job that fails a check is failed at once, not retried (its coordinator
 * stops with the reason). Nothing a job carries is executed: it names runs and a model by key and index.
 */
export async function serveBlocks(client: Redis, options: ServeOptions): Promise<{ blocks: number; refused: number }> {
  const say = options.onLine ?? (() => {});
  const ts = import.meta.url.endsWith('.ts');
  const pool = new Piscina({
    filename: fileURLToPath(new URL(`./block-thread.${ts ? 'ts' : 'js'}`, import.meta.url)),
    minThreads: 1,
    maxThreads: options.concurrency,
    idleTimeout: 60_000,
    execArgv: ts ? ['--import', 'tsx'] : [],
  });
  const runsCache = new Map<string, Promise<FleetRuns>>();
  const modelCache = new Map<string, Promise<{ message: ModelMessage; tag: ModelTag }>>();
  let blocks = 0;
  let refused = 0;

  const runsOf = (job: BlockJob): Promise<FleetRuns> => {
    let p = runsCache.get(job.fit);
    if (!p) {
      p = (async () => {
        const bytes = await client.getBuffer(fleetKeys(job.fit).runs);
        if (bytes === null) throw new WorkError(`fit ${job.fit.slice(0, 12)}: its runs must be in Redis, got none (the fit has ended or its keys expired)`);
        const sha = createHash('sha256').update(bytes).digest('hex');
        if (sha !== job.runs) throw new WorkError(`fit ${job.fit.slice(0, 12)}: the runs' SHA-256 must be the job's (${job.runs.slice(0, 12)}…), got ${sha.slice(0, 12)}…`);
        const runs = readRunsPayload(bytes, job.fit, `fit ${job.fit.slice(0, 12)} runs`);
        return { ...runs, packed: sharedCopy(runs.packed) };
      })();
      runsCache.set(job.fit, p);
      p.catch(() => runsCache.delete(job.fit));
      while (runsCache.size > 2) runsCache.delete(runsCache.keys().next().value!);
    }
    return p;
  };
  const modelOf = (job: BlockJob): Promise<{ message: ModelMessage; tag: ModelTag }> => {
    const id = `${job.fit}:${job.version}`;
    let p = modelCache.get(id);
    if (!p) {
      p = (async () => {
        const bytes = await client.getBuffer(fleetKeys(job.fit).model(job.version));
        if (bytes === null) throw new WorkError(`fit ${job.fit.slice(0, 12)}: model version ${job.version} must be in Redis, got none (the fit has moved on or ended)`);
        return readModelPayload(bytes, { fit: job.fit, version: job.version }, `fit ${job.fit.slice(0, 12)} model ${job.version}`);
      })();
      modelCache.set(id, p);
      p.catch(() => modelCache.delete(id));
      while (modelCache.size > 4) modelCache.delete(modelCache.keys().next().value!);
    }
    return p;
  };

  const processor = async (job: Job): Promise<{ bytes: number }> => {
    const started = Date.now();
    let data: BlockJob;
    try {
      data = checkBlockJob(job.data, `job ${String(job.id).slice(0, 24)}`);
    } catch (err) {
      throw new UnrecoverableError((err as Error).message);
    }
    let task: ThreadTask;
    try {
      const [runs, model] = await Promise.all([runsOf(data), modelOf(data)]);
      const nRuns = runs.packed.offsets.length - 1;
      const outside = data.members.find((r) => r >= nRuns);
      if (outside !== undefined) throw new WorkError(`job ${String(job.id).slice(0, 24)}: every run index must be below ${nRuns}, got ${outside}`);
      if (runs.maxCode >= model.message.surfaces.length) {
        throw new WorkError(`fit ${data.fit.slice(0, 12)}: every reading code must be below the model's ${model.message.surfaces.length} surfaces, got ${runs.maxCode}`);
      }
      const tag = { fit: data.fit, version: data.version, call: data.call, block: data.block, kind: data.kind };
      task = { tag, packed: runs.packed, model: model.message, mode: model.tag.mode, prune: model.tag.prune, members: data.members };
    } catch (err) {
      throw new UnrecoverableError((err as Error).message);
    }
    const bytes = (await pool.run(task)) as Uint8Array;
    await client.set(fleetKeys(data.fit).result(data.call, data.block), Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), 'PX', RESULT_TTL_MS);
    blocks++;
    say(`fit ${data.fit.slice(0, 12)} · model ${data.version} · ${data.kind} block ${data.block} (${data.members.length} runs) · ${Date.now() - started} ms · ${bytes.byteLength} bytes${job.stalledCounter > 0 ? ' · handed out again after a stalled worker' : ''}`);
    return { bytes: bytes.byteLength };
  };

  const worker = new Worker(BLOCK_QUEUE, processor, {
    connection: client,
    concurrency: options.concurrency,
    lockDuration: options.stallSeconds * 1000,
    stalledInterval: options.stallSeconds * 1000,
    maxStalledCount: MAX_STALLED,
    autorun: false,
  });
  worker.on('failed', (job, err) => {
    refused++;
    say(`job ${String(job?.id ?? '?').slice(0, 24)} refused: ${err.message.replace(/\s+/g, ' ')}`);
  });
  let lastTrouble = '';
  worker.on('error', (err) => {
    const line = `queue trouble: ${String((err as { code?: string }).code ?? err.message).replace(/\s+/g, ' ')}`;
    if (line !== lastTrouble) say(line);
    lastTrouble = line;
  });
  const running = worker.run();
  await new Promise<void>((resolve) => {
    if (options.signal?.aborted) resolve();
    options.signal?.addEventListener('abort', () => resolve(), { once: true });
  });
  await worker.close();
  await running.catch(() => {});
  await pool.destroy();
  return { blocks, refused };
}

/** The runs in shared memory, so every thread reads them without copies. */
function sharedCopy(p: PackedRuns): PackedRuns {
  const share = (a: Int32Array): Int32Array => {
    const out = new Int32Array(new SharedArrayBuffer(Math.max(4, a.byteLength)), 0, a.length);
    out.set(a);
    return out;
  };
  const out: PackedRuns = { ids: [], offsets: share(p.offsets), obs: share(p.obs) };
  if (p.dBin && p.hBin) {
    out.dBin = share(p.dBin);
    out.hBin = share(p.hBin);
  }
  return out;
}
