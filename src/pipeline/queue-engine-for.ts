import type { Redis } from 'ioredis';
import type { FitControl } from '../fit/fit-model.js';
import { connectRedis } from '../fleet/redis-connect.js';
import { QueueEngine, type QueueWait } from '../fleet/queue-engine.js';
import { queueTarget } from '../fleet/queue-target.js';
import type { QueueSetting } from './resolve-fit-options.js';

export type { QueueWait } from '../fleet/queue-engine.js';

/**
 * `--queue`: connects to Redis (one InputError line when unreachable or the login is refused) and
 * returns the fit's engine factory (`FitControl.engine`) and the function that closes the connection.
 * The password comes from the URL or `UNDERFOOT_REDIS_PASSWORD`.
 */
export async function queueEngineFor(
  setting: QueueSetting,
  where: string,
  onWait?: (wait: QueueWait) => void,
): Promise<{ engine: NonNullable<FitControl['engine']>; close: () => Promise<void> }> {
  const target = queueTarget(setting.url, where, process.env);
  const client: Redis = await connectRedis(target, where);
  return {
    engine: (packed, options) => new QueueEngine(packed, { ...options, client, target, timeoutSeconds: setting.timeoutSeconds, onWait }),
    close: async () => {
      if (client.status === 'ready') await Promise.race([client.quit().catch(() => {}), new Promise((r) => setTimeout(r, 2000))]);
      client.disconnect();
    },
  };
}
