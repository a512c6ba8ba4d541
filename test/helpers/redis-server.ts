import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer, connect } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** True when Debian's `redis-server` is on the PATH (CI installs it: `.ci/run`). */
export const HAS_REDIS = !spawnSync('redis-server', ['--version']).error;
if (!HAS_REDIS) console.warn('redis-server is not installed: the queue tests are skipped (apt-get install -y redis-server)');

/** A free TCP port on the loopback address (asked of the system, then released). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

export interface TestRedis {
  port: number;
  url: string;
  /** Stops the server (by its pid) and removes its folder. */
  stop: () => Promise<void>;
  /** Stops the server, keeping its port and folder (for a restart with `restart`). */
  kill: () => Promise<void>;
  restart: () => Promise<void>;
}

/**
 * A private Redis for one test file: loopback only, a free port, a temporary folder, no saving to
 * disk; `password` makes it require one.
 */
export async function startRedis(password?: string): Promise<TestRedis> {
  const dir = mkdtempSync(join(tmpdir(), 'underfoot-redis-'));
  const port = await freePort();
  let child: ChildProcess | null = null;
  const up = async (): Promise<void> => {
    const args = ['--port', String(port), '--bind', '127.0.0.1', '--dir', dir, '--save', '', '--appendonly', 'no', '--daemonize', 'no', ...(password ? ['--requirepass', password] : [])];
    child = spawn('redis-server', args, { stdio: 'ignore' });
    const started = Date.now();
    while (!(await accepts(port))) {
      if (Date.now() - started > 10_000) throw new Error(`redis-server did not start on port ${port}`);
      await new Promise((r) => setTimeout(r, 50));
    }
  };
  const down = async (): Promise<void> => {
    const c = child;
    child = null;
    if (!c || c.exitCode !== null) return;
    const exited = new Promise((r) => c.once('exit', r));
    c.kill('SIGKILL');
    await exited;
  };
  await up();
  return {
    port,
    url: `redis://127.0.0.1:${port}`,
    stop: async () => {
      await down();
      rmSync(dir, { recursive: true, force: true });
    },
    kill: down,
    restart: up,
  };
}

function accepts(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = connect(port, '127.0.0.1');
    s.once('connect', () => {
      s.destroy();
      resolve(true);
    });
    s.once('error', () => resolve(false));
  });
}
