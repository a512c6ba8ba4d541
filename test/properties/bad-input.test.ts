import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import fc from 'fast-check';
import { existsSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { fcSeed } from '../helpers/fc-seed.js';
import { tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { main } from '../../src/cli/main.js';
import type { CliIo } from '../../src/cli/cli-io.js';

// Valid inputs (an invented 3 × 2 floor, a small runs table and a model fitted to it), then random
// damage: the tool must either succeed or fail with one line "underfoot: …" (exit 1 or 2), never crash
// with an internal error, never hang, and never leave a partial or temporary output behind.
const tmp = tempDir();
const p = tmp.path;
const floor = gridFloor(3, 2, ['oak', 'carpet', 'tile'], (x, y) => (x + y) % 3, 'fuzz floor');
const valid: Record<string, Buffer> = {};

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => void (out += t), err: (t) => void (err += t), errIsTty: false };
  const code = await main(args, io);
  return { code, out, err };
}

beforeAll(async () => {
  writeFileSync(p('floor.json'), JSON.stringify(floor, null, 1));
  expect((await run(['simulate', '--floor', p('floor.json'), '--runs', '4', '--steps', '30', '--seed', '3', '--dropout-rate', '0.1', '--out', p('runs.csv')])).code).toBe(0);
  expect((await run(['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('model.json'), '--restarts', '1', '--max-iter', '3', '--workers', '1', '--quiet'])).code).toBe(0);
  for (const f of ['floor.json', 'runs.csv', 'model.json']) valid[f] = readFileSync(p(f));
});
afterAll(() => tmp.remove());

/** A random damage to a file's bytes. */
const damage = fc.oneof(
  fc.record({ kind: fc.constant('truncate' as const), at: fc.double({ min: 0, max: 1, noNaN: true }) }),
  fc.record({ kind: fc.constant('delete' as const), at: fc.double({ min: 0, max: 1, noNaN: true }), length: fc.integer({ min: 1, max: 40 }) }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.double({ min: 0, max: 1, noNaN: true }), bytes: fc.uint8Array({ minLength: 1, maxLength: 8 }) }),
  fc.record({
    kind: fc.constant('text' as const),
    at: fc.double({ min: 0, max: 1, noNaN: true }),
    text: fc.constantFrom('NaN', '-1', '1e309', '""', ',', '\n', '\r\n', '"', 'null', '{}', '[]', '\uFEFF', 'Oak ', ' ', '\u0000', '99999999999999999999', '0.5.5'),
  }),
  fc.record({ kind: fc.constant('duplicate-line' as const), at: fc.double({ min: 0, max: 1, noNaN: true }) }),
);

type Damage = typeof damage extends fc.Arbitrary<infer T> ? T : never;

function applyDamage(bytes: Buffer, d: Damage): Buffer {
  const at = Math.floor(d.at * bytes.length);
  switch (d.kind) {
    case 'truncate':
      return bytes.subarray(0, at);
    case 'delete':
      return Buffer.concat([bytes.subarray(0, at), bytes.subarray(Math.min(bytes.length, at + d.length))]);
    case 'insert':
      return Buffer.concat([bytes.subarray(0, at), Buffer.from(d.bytes), bytes.subarray(at)]);
    case 'text':
      return Buffer.concat([bytes.subarray(0, at), Buffer.from(d.text, 'utf8'), bytes.subarray(at)]);
    default: {
      const text = bytes.toString('latin1');
      const lines = text.split('\n');
      const k = Math.floor(d.at * lines.length);
      lines.splice(k, 0, lines[Math.min(k, lines.length - 1)]);
      return Buffer.from(lines.join('\n'), 'latin1');
    }
  }
}

function expectCleanOutcome(r: { code: number; err: string }, outputs: string[]): void {
  expect([0, 1, 2]).toContain(r.code);
  if (r.code !== 0) {
    const lines = r.err.trimEnd().split('\n').filter((l) => !l.startsWith('warning: '));
    expect(lines, r.err).toHaveLength(1);
    expect(lines[0]).toMatch(/^underfoot: /);
    expect(lines[0]).not.toContain('internal error');
    for (const o of outputs) expect(existsSync(o), `${o} after a failure`).toBe(false);
  }
  expect(readdirSync(tmp.dir).filter((f) => f.includes('.tmp-'))).toEqual([]);
}

describe('damaged inputs (fast-check)', () => {
  for (const target of ['floor.json', 'runs.csv', 'model.json'] as const) {
    it(`damaged ${target}: check/decode succeed or fail with one clear line, never crash, never leave partial output`, async () => {
      await fc.assert(
        fc.asyncProperty(fc.array(damage, { minLength: 1, maxLength: 3 }), async (damages) => {
          let bytes = valid[target];
          for (const d of damages) bytes = applyDamage(bytes, d);
          const files = { ...valid, [target]: bytes };
          for (const [name, data] of Object.entries(files)) writeFileSync(p(`d-${name}`), data);
          for (const o of ['d-out.csv', 'd-summary.csv']) rmSync(p(o), { force: true });
          if (target !== 'model.json') {
            expectCleanOutcome(await run(['check', '--floor', p('d-floor.json'), '--runs', p('d-runs.csv')]), []);
          }
          const dec = await run(['decode', '--model', p('d-model.json'), '--floor', p('d-floor.json'), '--runs', p('d-runs.csv'), '--out', p('d-out.csv'), '--summary', p('d-summary.csv')]);
          expectCleanOutcome(dec, [p('d-out.csv'), p('d-summary.csv')]);
        }),
        { seed: fcSeed, numRuns: 80 },
      );
    });
  }

  it('damaged floor or runs in fit: succeeds or fails with one clear line and writes no model', async () => {
    await fc.assert(
      fc.asyncProperty(fc.constantFrom('floor.json', 'runs.csv'), fc.array(damage, { minLength: 1, maxLength: 2 }), async (target, damages) => {
        let bytes = valid[target];
        for (const d of damages) bytes = applyDamage(bytes, d);
        const files = { ...valid, [target]: bytes };
        for (const [name, data] of Object.entries(files)) writeFileSync(p(`f-${name}`), data);
        rmSync(p('f-model-out.json'), { force: true });
        const r = await run(['fit', '--floor', p('f-floor.json'), '--runs', p('f-runs.csv'), '--out', p('f-model-out.json'), '--restarts', '1', '--max-iter', '2', '--workers', '1', '--quiet']);
        expectCleanOutcome(r, [p('f-model-out.json')]);
      }),
      { seed: fcSeed, numRuns: 40 },
    );
  });
});
