import { InputError, quote } from '../errors.js';

/** Where the queue is: a Redis server, and how to log in to it (never printed: see `shown`). */
export interface QueueTarget {
  host: string;
  port: number;
  db: number;
  tls: boolean;
  username?: string;
  password?: string;
  /** The address as messages show it: scheme, host, port and database, without user or password. */
  shown: string;
}

/** Environment variables read for the login when the URL has none (`UNDERFOOT_REDIS_USER`, `UNDERFOOT_REDIS_PASSWORD`). */
export const QUEUE_ENV = { user: 'UNDERFOOT_REDIS_USER', password: 'UNDERFOOT_REDIS_PASSWORD' } as const;

/**
 * Reads `--queue redis://[user[:password]@]host[:port][/db]` (or `rediss://` for TLS). The user and
 * password come from the URL, else from the environment (`QUEUE_ENV`). Messages never quote the URL
 * as given (it may hold the password), only `shown`.
 */
export function queueTarget(url: string, where: string, env: Readonly<Record<string, string | undefined>> = {}): QueueTarget {
  const fail = (requirement: string, got: string): never => {
    throw new InputError(`${where}: --queue must be ${requirement}, got ${got}`);
  };
  let u: URL;
  try {
    u = new URL(url);
  } catch {
    return fail('a URL such as redis://HOST:PORT', 'text that is not a URL (not shown: it may hold a password)');
  }
  if (u.protocol !== 'redis:' && u.protocol !== 'rediss:') fail('a redis:// or rediss:// URL', quote(u.protocol));
  if (u.hostname === '') fail('a URL with a host', 'none');
  const port = u.port === '' ? 6379 : Number(u.port);
  const path = u.pathname.replace(/^\//, '');
  if (path !== '' && !/^\d{1,2}$/.test(path)) fail('a URL whose path is a database number (0 to 99)', quote(path));
  if (u.search !== '' || u.hash !== '') fail('a URL without a query or fragment', 'one');
  const db = path === '' ? 0 : Number(path);
  const username = u.username !== '' ? decodeURIComponent(u.username) : env[QUEUE_ENV.user] || undefined;
  const password = u.password !== '' ? decodeURIComponent(u.password) : env[QUEUE_ENV.password] || undefined;
  const host = u.hostname.replace(/^\[|\]$/g, '');
  const shown = `${u.protocol}//${u.hostname}:${port}${db ? `/${db}` : ''}`;
  return { host, port, db, tls: u.protocol === 'rediss:', username, password, shown };
}
