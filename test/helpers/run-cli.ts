import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export const BIN = fileURLToPath(new URL('../../dist/src/cli/bin.js', import.meta.url));

export interface CliResult {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Runs the built command as a user would (npm test builds dist/ first). */
export function runCli(args: string[], cwd?: string): CliResult {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd, encoding: 'utf8', env: { ...process.env, FORCE_COLOR: '0' } });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** A fresh temporary folder and a function that removes it. */
export function tempDir(prefix = 'underfoot-test-'): { dir: string; path: (name: string) => string; remove: () => void } {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  return { dir, path: (name) => join(dir, name), remove: () => rmSync(dir, { recursive: true, force: true }) };
}
