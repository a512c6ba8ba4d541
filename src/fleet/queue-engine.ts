import { createHash, randomUUID } from 'node:crypto';
import { Queue, QueueEvents } from 'bullmq';
import type { Redis } from 'ioredis';
import { WorkError } from '../errors.js';
import type { HmmModel, TransitionMode } from '../model/hmm-model.js';
import type { BlockCounts } from '../fit/accumulate-block.js';
import type { EStepEngine } from '../fit/e-step-engine.js';
import type { EngineOptions } from '../fit/local-engine.js';
import type { PackedRuns } from '../fit/packed-runs.js';
import type { BlockScore } from '../fit/score-block.js';
import { BLOCK_QUEUE, blockJobId, fleetKeys, type BlockJob } from './block-job.js';
import { packModelPayload } from './model-payload.js';
import { readBlockResult } from './result-payload.js';
import { packRunsPayload } from './runs-payload.js';
import type { QueueTarget } from './queue-target.js';

/** The coordinator's wait for workers, reported every `noticeSeconds` while no block is taken or finished. */
export interface QueueWait {
  /** Seconds since a block of this pass was last taken or finished (or since the pass began). */
  idleSeconds: number;
  done: number;
  total: number;
  queue: string;
}

export interface QueueEngineOptions extends EngineOptions {
  /** Connected client (`connectRedis`); the engine never closes it (its owner does). */
  client: Redis;
  target: QueueTarget;
  /** Stop with a WorkError when no block is taken or finished for this long (`--queue-timeout`); null = wait. */
  timeoutSeconds?: number | null;
  /** @default 10 */
  noticeSeconds?: number;
  onWait?: (wait: QueueWait) => void;
  /** Seconds the connection may be down before the fit stops (it then resumes from its checkpoint). @default 10 */
  lostSeconds?: number;
}

/** The fit's keys expire this long after their last use, so a coordinator that died leaves nothing for long. */
const KEY_TTL_MS = 24 * 3_600_000;

/**
 * The E-step engine over a BullMQ queue on Redis (`fit --queue`). On its first pass it stores the fit's
 * packed runs in Redis once (`packRunsPayload`, under the fit's key: a digest of the runs, the E-step
 * settings and a random part, so two fits never share keys or jobs); each new model is stored once
 * (`packModelPayload`, a version number per model). Every pass (`counts` or `score`) adds one job per
 * block carrying only the fit key, the runs' digest, the model version, the pass number, the block
 * index and its run indices (`BlockJob`); workers (`serveBlocks`) store each block's result under the
 * fit's keys; this engine reads each result when BullMQ reports its job completed, checks it against
 * the job (`readBlockResult`) and places it by block index. The caller reduces the blocks in block order
 * (`reduceBlocks`), so the model is byte-identical to `--workers 1`.
 *
 * A worker killed mid-block loses its job's lock; BullMQ's stalled-job check in the other workers hands
 * the job out again, and the block's result is the same wherever it is computed. While no block is
 * taken or finished the engine reports a `QueueWait` every `noticeSeconds`, and gives up after
 * `timeoutSeconds` if set. A connection down for `lostSeconds` ends the pass with one WorkError line.
 */
export class QueueEngine implements EStepEngine {
  readonly workers = 1;
  private readonly mode: TransitionMode;
  private readonly prune: number;
  private readonly fit: string;
  private readonly keys: ReturnType<typeof fleetKeys>;
  private setup: Promise<{ queue: Queue; events: QueueEvents; runs: string }> | null = null;
  private last: { model: HmmModel; version: number } | null = null;
  private version = 0;
  private calls = 0;
  private readonly stored: string[] = [];
  private readonly pending = new Map<string, PendingJob>();
  private closed = false;

  constructor(
    private readonly packed: PackedRuns,
    private readonly options: QueueEngineOptions,
  ) {
    this.mode = options.mode ?? 'learned';
    this.prune = options.prune ?? 0;
    const h = createHash('sha256').update(JSON.stringify({ nonce: randomUUID(), mode: this.mode, prune: this.prune, ids: packed.ids }));
    h.update(new Uint8Array(packed.obs.buffer, packed.obs.byteOffset, packed.obs.byteLength));
    this.fit = h.digest('hex');
    this.keys = fleetKeys(this.fit);
  }

  /** The fit's key (hex SHA-256), as jobs and Redis keys carry it. */
  get fitKey(): string {
    return this.fit;
  }

  counts(model: HmmModel, blocks: number[][]): Promise<BlockCounts[]> {
    return this.run('counts', model, blocks) as Promise<BlockCounts[]>;
  }

  score(model: HmmModel, blocks: number[][]): Promise<BlockScore[]> {
    return this.run('score', model, blocks) as Promise<BlockScore[]>;
  }

  /** Removes the fit's waiting jobs and keys (each step bounded in time: Redis may be gone) and closes the queue. */
  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    if (!this.setup) return;
    const setup = await this.setup.catch(() => null);
    const client = this.options.client;
    if (client.status === 'ready') {
      await bounded(
        (async () => {
          for (const id of this.pending.keys()) await setup?.queue.remove(id).catch(() => 0);
          const keys: string[] = [this.keys.runs, ...this.stored];
          let cursor = '0';
          do {
            const [next, found] = await client.scan(cursor, 'MATCH', `underfoot:${this.fit}:result:*`, 'COUNT', 1000);
            keys.push(...found);
            cursor = next;
          } while (cursor !== '0');
          await client.del(...keys);
        })(),
        5000,
      );
    }
    if (setup) {
      await bounded(setup.events.close(), 2000);
      await bounded(setup.queue.close(), 2000);
      setup.events.disconnect().catch(() => {});
    }
  }

  private async run(kind: BlockJob['kind'], model: HmmModel, blocks: number[][]): Promise<Array<BlockCounts | BlockScore>> {
    if (this.closed) throw new WorkError('fit --queue: the queue engine must be open, got it closed');
    const watch = new Watch(this.options, blocks.length);
    try {
      const { queue, runs } = await watch.guard(this.ready());
      const version = await watch.guard(this.versionOf(model));
      const call = ++this.calls;
      const results = new Array<BlockCounts | BlockScore>(blocks.length);
      const dims = { nCells: model.structure.nCells, nnz: model.structure.nnz, nReadings: model.surfaces.length };
      const finished = new Promise<void>((resolve, reject) => {
        let left = blocks.length;
        if (left === 0) resolve();
        blocks.forEach((_, block) => {
          const id = blockJobId({ fit: this.fit, call, block });
          this.pending.set(id, {
            active: () => watch.progress(),
            completed: async () => {
              const key = this.keys.result(call, block);
              const bytes = await this.options.client.getBuffer(key);
              if (bytes === null) throw new WorkError(`fit --queue: block ${block}'s result must be in Redis, got none`);
              results[block] = readBlockResult(bytes, { fit: this.fit, version, call, block, kind }, dims, `fit --queue: block ${block}'s result`);
              await this.options.client.del(key);
              this.pending.delete(id);
              watch.progress(1);
              if (--left === 0) resolve();
            },
            failed: (reason) => reject(new WorkError(`fit --queue: block ${block} must be computed by a worker, got a failure (${reason.replace(/\s+/g, ' ')})`)),
          });
        });
      });
      finished.catch(() => {}); // awaited below; a failure before then must not count as unhandled
      const jobs = blocks.map((members, block) => {
        const data: BlockJob = { fit: this.fit, runs, version, call, kind, block, members };
        return { name: kind, data, opts: { jobId: blockJobId(data), removeOnComplete: true, removeOnFail: { count: 1000 }, attempts: 1 } };
      });
      await watch.guard(queue.addBulk(jobs));
      await watch.guard(finished);
      return results;
    } finally {
      watch.stop();
    }
  }

  /** Stores the runs once and starts listening to the queue's events (from the stream's current end). */
  private ready(): Promise<{ queue: Queue; events: QueueEvents; runs: string }> {
    this.setup ??= (async () => {
      const client = this.options.client;
      const payload = packRunsPayload(this.packed, this.fit);
      const runs = createHash('sha256').update(payload).digest('hex');
      await client.set(this.keys.runs, payload, 'PX', KEY_TTL_MS);
      const queue = new Queue(BLOCK_QUEUE, { connection: client });
      queue.on('error', () => {}); // connection trouble: reported by `Watch` from the client's status (BullMQ would print a stack)
      const newest = await client.xrevrange(queue.keys.events, '+', '-', 'COUNT', 1);
      const events = new QueueEvents(BLOCK_QUEUE, { connection: client.duplicate(), lastEventId: newest[0]?.[0] ?? '0-0', autorun: true });
      events.on('active', ({ jobId }) => this.pending.get(jobId)?.active());
      events.on('completed', ({ jobId }) => {
        const p = this.pending.get(jobId);
        p?.completed().catch((err: Error) => p.failed(err.message));
      });
      events.on('failed', ({ jobId, failedReason }) => this.pending.get(jobId)?.failed(failedReason));
      events.on('error', () => {}); // connection trouble: reported by `Watch` from the client's status
      await events.waitUntilReady();
      return { queue, events, runs };
    })();
    return this.setup;
  }

  /** The version of `model` (one per model object), its payload stored when new; the older one removed. */
  private async versionOf(model: HmmModel): Promise<number> {
    if (this.last?.model === model) return this.last.version;
    const version = ++this.version;
    const key = this.keys.model(version);
    await this.options.client.set(key, packModelPayload(model, { fit: this.fit, version, mode: this.mode, prune: this.prune }), 'PX', KEY_TTL_MS);
    this.stored.push(key);
    // Jobs of earlier passes are all finished (passes run one at a time): older models are not needed.
    while (this.stored.length > 1) await this.options.client.del(this.stored.shift()!);
    this.last = { model, version };
    return version;
  }
}

interface PendingJob {
  active: () => void;
  completed: () => Promise<void>;
  failed: (reason: string) => void;
}

/**
 * One pass's clock: reports waits (`onWait`), fails the pass after `timeoutSeconds` without progress or
 * when the connection stays down `lostSeconds`; `guard` races a promise against that failure.
 */
class Watch {
  private lastProgress = Date.now();
  private lastNotice = Date.now();
  private downSince: number | null = null;
  private done = 0;
  private readonly timer: ReturnType<typeof setInterval>;
  private fail!: (err: Error) => void;
  private readonly failure: Promise<never>;

  constructor(
    private readonly o: QueueEngineOptions,
    private readonly total: number,
  ) {
    this.failure = new Promise<never>((_, reject) => (this.fail = reject));
    this.failure.catch(() => {});
    this.timer = setInterval(() => this.tick(), 250);
  }

  progress(blocks = 0): void {
    this.done += blocks;
    this.lastProgress = Date.now();
    this.lastNotice = this.lastProgress;
  }

  guard<T>(p: Promise<T>): Promise<T> {
    return Promise.race([p, this.failure]);
  }

  stop(): void {
    clearInterval(this.timer);
  }

  private tick(): void {
    const now = Date.now();
    const o = this.o;
    if (o.client.status !== 'ready') {
      this.downSince ??= now;
      if (now - this.downSince >= (o.lostSeconds ?? 10) * 1000) {
        this.fail(
          new WorkError(
            `fit --queue: Redis at ${o.target.shown} must stay reachable during the fit, got the connection lost for ${o.lostSeconds ?? 10} s; with --checkpoint DIR the same command resumes from the last finished iteration`,
          ),
        );
      }
      return;
    }
    this.downSince = null;
    const idle = (now - this.lastProgress) / 1000;
    if (o.timeoutSeconds != null && idle >= o.timeoutSeconds) {
      this.fail(
        new WorkError(
          `fit --queue: a worker must take or finish a block within --queue-timeout ${o.timeoutSeconds} s, got none for ${Math.floor(idle)} s (${this.done} of ${this.total} blocks done); start one with: underfoot worker --queue ${o.target.shown}`,
        ),
      );
      return;
    }
    if (now - this.lastNotice >= (o.noticeSeconds ?? 10) * 1000) {
      this.lastNotice = now;
      o.onWait?.({ idleSeconds: Math.floor(idle), done: this.done, total: this.total, queue: o.target.shown });
    }
  }
}

function bounded<T>(p: Promise<T>, ms: number): Promise<T | undefined> {
  let timer: ReturnType<typeof setTimeout> | undefined;
  return Promise.race([p.catch(() => undefined), new Promise<undefined>((resolve) => (timer = setTimeout(() => resolve(undefined), ms)))]).finally(() => clearTimeout(timer));
}
