import { execFileSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

// The layer rules of .dependency-cruiser.cjs, run by `npm test` over src/ (script `lint:deps`).
// Here they are run over a planted fixture tree, so a rule that stopped working would fail this test.
const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const depcruise = join(root, 'node_modules', '.bin', 'depcruise');

interface Violation {
  rule: { name: string };
  from: string;
  to: string;
}

function cruise(cwd: string): Violation[] {
  let out: string;
  try {
    out = execFileSync(depcruise, ['src', '--config', join(root, '.dependency-cruiser.cjs'), '--output-type', 'json'], {
      cwd,
      encoding: 'utf8',
    });
  } catch (e) {
    // depcruise exits with the number of errors; its JSON is still on stdout.
    out = (e as { stdout: string }).stdout;
  }
  return (JSON.parse(out) as { summary: { violations: Violation[] } }).summary.violations;
}

describe('layer rules (.dependency-cruiser.cjs)', () => {
  it('fail on every planted violation and pass the allowed import', () => {
    const found = cruise(join(root, 'test', 'fixtures', 'layers'))
      .map((v) => `${v.rule.name} ${v.from} -> ${v.to}`)
      .sort();
    expect(found).toEqual(
      [
        'cli-imports-only-pipeline src/cli/bad-command.ts -> src/io/read-thing.ts',
        'fleet-imports-only-fit-model-kernels src/fleet/bad-fleet.ts -> src/pipeline/good-step.ts',
        'kernels-are-pure src/kernels/bad-kernel.ts -> fs',
        'kernels-imports-only-itself src/kernels/bad-kernel.ts -> src/io/read-thing.ts',
        'no-cycles src/fit/cycle-a.ts -> src/fit/cycle-b.ts',
        'only-io-touches-files src/kernels/bad-kernel.ts -> fs',
      ].sort(),
    );
  });

  it('hold for the project itself', () => {
    expect(cruise(root).map((v) => `${v.rule.name} ${v.from} -> ${v.to}`)).toEqual([]);
  });
});
