import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { BIN, runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { Redis } from 'ioredis';
import { HAS_REDIS, freePort, startRedis, type TestRedis } from '../helpers/redis-server.js';

// `fit --queue` through the built command with real worker processes on a private Redis (loopback, a
// free port, a password). Skipped, with a message, only when redis-server is not installed.
const PASSWORD = 'queue-test-secret-7d1f';
const env = { ...process.env, FORCE_COLOR: '0', UNDERFOOT_REDIS_PASSWORD: PASSWORD };
const floor = gridFloor(6, 5, ['oak', 'carpet', 'tile'], (x, y) => (x * 2 + y) % 3, 'queue test floor');
const tmp = tempDir();
const p = tmp.path;
const fitArgs = (out: string, extra: string[] = []) => [
  'fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', out,
  '--restarts', '2', '--transitions', 'tied', '--max-iter', '8', '--tol', '0', ...extra,
];
let redis: TestRedis;

interface Spawned {
  child: ChildProcess;
  out: () => string;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

function spawnCli(args: string[]): Spawned {
  const child = spawn(process.execPath, [BIN, ...args], { stdio: ['ignore', 'pipe', 'pipe'], env });
  let text = '';
  child.stdout!.on('data', (d) => (text += d));
  child.stderr!.on('data', (d) => (text += d));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.on('exit', (code, signal) => resolve({ code, signal })));
  return { child, out: () => text, exited };
}

const startWorker = (extra: string[] = []): Spawned => spawnCli(['worker', '--queue', redis.url, '--stall-seconds', '2', ...extra]);

async function stopWorker(w: Spawned): Promise<void> {
  if (w.child.exitCode === null && w.child.signalCode === null) w.child.kill('SIGTERM');
  await w.exited;
}

async function waitFor(test: () => boolean, what: string, ms = 60_000): Promise<void> {
  const started = Date.now();
  while (!test()) {
    if (Date.now() - started > ms) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe.skipIf(!HAS_REDIS)('fit --queue with worker processes', () => {
  beforeAll(async () => {
    redis = await startRedis(PASSWORD);
    writeFileSync(p('floor.json'), JSON.stringify(floor));
    const sim = runCli(['simulate', '--floor', p('floor.json'), '--runs', '40', '--steps', '200', '--seed', '11', '--hit', '0.8', '--out', p('runs.csv')]);
    expect(sim.code, sim.stderr).toBe(0);
    const ref = runCli(fitArgs(p('reference.json'), ['--workers', '1']));
    expect(ref.code, ref.stderr).toBe(0);
  });
  afterAll(async () => {
    await redis?.stop();
    tmp.remove();
  });

  it('two workers: the model file is byte-identical to --workers 1', async () => {
    const workers = [startWorker(), startWorker()];
    try {
      await waitFor(() => workers.every((w) => w.out().includes('serving blocks')), 'the workers to connect');
      const fit = spawnCli(fitArgs(p('two.json'), ['--queue', redis.url]));
      const end = await fit.exited;
      expect(end.code, fit.out()).toBe(0);
      expect(readFileSync(p('two.json'))).toEqual(readFileSync(p('reference.json')));
      const lines = workers.map((w) => w.out().split('\n').filter((l) => l.includes(' block ')).length);
      expect(lines[0] + lines[1]).toBeGreaterThan(20);
      // The password is never printed.
      expect(fit.out() + workers[0].out() + workers[1].out()).not.toContain(PASSWORD);
    } finally {
      await Promise.all(workers.map(stopWorker));
    }
  });

  it('a worker killed with SIGKILL mid-block: the block is handed out again and the bytes are the same', async () => {
    // The victim works alone, so any active job is its own. It is frozen (SIGSTOP) until it is caught
    // holding a job, then killed (SIGKILL) at that moment: a kill -9 in the middle of a block.
    const victim = startWorker();
    let other: Spawned | null = null;
    const redisClient = new Redis({ host: '127.0.0.1', port: redis.port, password: PASSWORD, maxRetriesPerRequest: 1 });
    try {
      await waitFor(() => victim.out().includes('serving blocks'), 'the victim to connect');
      const fit = spawnCli(fitArgs(p('killed.json'), ['--queue', redis.url]));
      await waitFor(() => victim.out().split('\n').filter((l) => l.includes(' block ')).length >= 3, 'the victim to compute blocks');
      let caught = false;
      for (let attempt = 0; attempt < 200 && !caught; attempt++) {
        victim.child.kill('SIGSTOP');
        await new Promise((r) => setTimeout(r, 20));
        caught = (await redisClient.llen('bull:underfoot-blocks:active')) > 0;
        if (!caught) {
          victim.child.kill('SIGCONT');
          await new Promise((r) => setTimeout(r, 3 + (attempt % 7)));
        }
      }
      expect(caught, 'the victim was never caught holding a block').toBe(true);
      victim.child.kill('SIGKILL');
      expect((await victim.exited).signal).toBe('SIGKILL');
      other = startWorker();
      const end = await fit.exited;
      expect(end.code, fit.out()).toBe(0);
      expect(readFileSync(p('killed.json'))).toEqual(readFileSync(p('reference.json')));
      expect(other.out()).toContain('handed out again after a stalled worker');
    } finally {
      redisClient.disconnect();
      await Promise.all([stopWorker(victim), ...(other ? [stopWorker(other)] : [])]);
    }
  });

  it('Redis lost mid-fit: one line, exit 1; with --checkpoint the same command then resumes to the same bytes', async () => {
    const workers = [startWorker(), startWorker()];
    const dir = p('cp-lost');
    const args = fitArgs(p('lost.json'), ['--queue', redis.url, '--checkpoint', dir]);
    try {
      await waitFor(() => workers.every((w) => w.out().includes('serving blocks')), 'the workers to connect');
      const fit = spawnCli(args);
      await waitFor(() => {
        try {
          const cp = JSON.parse(readFileSync(`${dir}/fit-checkpoint.json`, 'utf8'));
          return cp.current !== null && cp.current.iterations >= 2;
        } catch {
          return false;
        }
      }, 'the checkpoint to show progress');
      await redis.kill();
      const end = await fit.exited;
      expect(end.code).toBe(1);
      expect(fit.out().trim().split('\n')).toEqual([
        `underfoot: fit --queue: Redis at ${redis.url} must stay reachable during the fit, got the connection lost for 10 s; with --checkpoint DIR the same command resumes from the last finished iteration`,
      ]);
      expect(existsSync(p('lost.json'))).toBe(false);
      await redis.restart();
      const again = spawnCli(args);
      const second = await again.exited;
      expect(second.code, again.out()).toBe(0);
      expect(readFileSync(p('lost.json'))).toEqual(readFileSync(p('reference.json')));
    } finally {
      await Promise.all(workers.map(stopWorker));
    }
  });

  it('no worker: --queue-timeout stops the fit cleanly with one line, nothing written', async () => {
    const fit = spawnCli(fitArgs(p('timeout.json'), ['--queue', redis.url, '--queue-timeout', '2']));
    const end = await fit.exited;
    expect(end.code).toBe(1);
    const lines = fit.out().trim().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^underfoot: fit --queue: a worker must take or finish a block within --queue-timeout 2 s, got none for 2 s \(0 of \d+ blocks done\); start one with: underfoot worker --queue redis:\/\/127\.0\.0\.1:\d+$/);
    expect(existsSync(p('timeout.json'))).toBe(false);
  });

  it('an unreachable Redis: one line, exit 2, nothing written', async () => {
    const port = await freePort();
    const r = runCli(fitArgs(p('unreachable.json'), ['--queue', `redis://127.0.0.1:${port}`]));
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`underfoot: fit: Redis at redis://127.0.0.1:${port} must be reachable, got ECONNREFUSED\n`);
    expect(existsSync(p('unreachable.json'))).toBe(false);
  });

  it('a wrong password: one line, exit 2, the password not shown', () => {
    const r = runCli(fitArgs(p('wrong.json'), ['--queue', `redis://:not-the-password@127.0.0.1:${redis.port}`]));
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(
      `underfoot: fit: Redis at redis://127.0.0.1:${redis.port} must accept the login (user and password from the URL or UNDERFOOT_REDIS_USER / UNDERFOOT_REDIS_PASSWORD), got WRONGPASS\n`,
    );
    expect(existsSync(p('wrong.json'))).toBe(false);
    const w = runCli(['worker', '--queue', `redis://:not-the-password@127.0.0.1:${redis.port}`]);
    expect(w.code).toBe(2);
    expect(w.stderr).not.toContain('not-the-password');
  });
});
