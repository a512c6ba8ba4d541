import { Redis } from 'ioredis';
import { InputError } from '../errors.js';
import { QUEUE_ENV, type QueueTarget } from './queue-target.js';

/** How long the first connection may take before the queue counts as unreachable. */
const CONNECT_TIMEOUT_MS = 5000;

/**
 * A connected Redis client for `target`, or one InputError line (exit 2) saying why not: unreachable
 * (refused, unknown host, timed out) or the login refused. The message names the server by
 * `target.shown` only. After the first connection the client reconnects by itself (every 0.2 to 2 s),
 * and commands wait while it does (`maxRetriesPerRequest: null`, as BullMQ's workers require): the
 * caller decides how long to wait (see `QueueEngine`).
 */
export async function connectRedis(target: QueueTarget, where: string): Promise<Redis> {
  let connected = false;
  const client = new Redis({
    host: target.host,
    port: target.port,
    db: target.db,
    username: target.username,
    password: target.password,
    ...(target.tls ? { tls: {} } : {}),
    lazyConnect: true,
    connectTimeout: CONNECT_TIMEOUT_MS,
    maxRetriesPerRequest: null,
    enableReadyCheck: true,
    retryStrategy: (times) => (connected ? Math.min(200 * times, 2000) : null),
  });
  let lastError: unknown = null;
  client.on('error', (err) => {
    lastError = err;
  });
  try {
    await client.connect();
    await client.ping();
    connected = true;
    return client;
  } catch (err) {
    client.disconnect();
    throw redisError(lastError ?? err, target, where);
  }
}

/** The one line for a failed connection: what went wrong, by its code, never with the login. */
export function redisError(err: unknown, target: QueueTarget, where: string): InputError {
  const e = err as { code?: unknown; message?: unknown } | null;
  const message = String(e?.message ?? err);
  const word = /^(WRONGPASS|NOAUTH|NOPERM)\b/.exec(message)?.[1];
  if (word) {
    return new InputError(
      `${where}: Redis at ${target.shown} must accept the login (user and password from the URL or ${QUEUE_ENV.user} / ${QUEUE_ENV.password}), got ${word}`,
    );
  }
  const code = typeof e?.code === 'string' ? e.code : /timeout|timed out/i.test(message) ? 'ETIMEDOUT' : message.replace(/\s+/g, ' ').slice(0, 80);
  return new InputError(`${where}: Redis at ${target.shown} must be reachable, got ${code}`);
}
