import { connectRedis } from '../fleet/redis-connect.js';
import { queueTarget } from '../fleet/queue-target.js';
import { serveBlocks } from '../fleet/serve-blocks.js';

export interface WorkerConfig {
  queue: string;
  concurrency: number;
  stallSeconds: number;
  signal?: AbortSignal;
  onLine?: (line: string) => void;
}

/** `worker`: connects to the queue's Redis and computes blocks for any fit until stopped (see `serveBlocks`). */
export async function serveQueue(config: WorkerConfig): Promise<{ blocks: number; refused: number; queue: string }> {
  const target = queueTarget(config.queue, 'worker', process.env);
  const client = await connectRedis(target, 'worker');
  try {
    config.onLine?.(`serving blocks from ${target.shown} (${config.concurrency} at a time)`);
    const done = await serveBlocks(client, { concurrency: config.concurrency, stallSeconds: config.stallSeconds, signal: config.signal, onLine: config.onLine });
    return { ...done, queue: target.shown };
  } finally {
    await Promise.race([client.quit().catch(() => {}), new Promise((r) => setTimeout(r, 2000))]);
    client.disconnect();
  }
}
