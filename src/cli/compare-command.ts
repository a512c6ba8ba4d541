import type { Command } from 'commander';
import type { CompareConfig, CompareOutcome } from '../pipeline/compare-from-files.js';
import { DEFAULT_NULL_DRAWS, resolveCompareOptions } from '../pipeline/resolve-compare-options.js';
import { DEFAULT_REFIT_SEARCH } from '../pipeline/cli-surface.js';
import { addCompressionOption, addKeyColumnOptions, addOutputOptions, keyColumnsFrom } from './common-options.js';
import type { CliIo } from './cli-io.js';
import { compareProgress } from './progress.js';
import { formatTable } from './format-table.js';

/** Printed with every comparison. */
export const COMPARE_CAUTION =
  'Statistical evidence of a change is not an inspection: confirm flagged cells on site before acting on them.';

export function registerCompare(program: Command, io: CliIo): void {
  const cmd = program
    .command('compare')
    .description('after flooring changes: re-fit the old model on new runs and find which cells changed')
    .requiredOption('--model <file>', 'the old (calibrated) model')
    .requiredOption('--floor <file>', 'floor file the old model was made for')
    .requiredOption('--runs <files...>', 'runs recorded since the change')
    .requiredOption('--out <file>', 'changes table to write (.csv, .arrow, .arrows)')
    .option('--refit <file>', 'write the re-fitted model here')
    .option('--write-floor <file>', 'write a floor file whose changed cells carry their new surface')
    .option('--fdr <q>', 'false-discovery rate across cells (Benjamini–Hochberg)', '0.05')
    .option('--min-readings <n>', 'cells with fewer expected readings are "too-few-readings"', '100')
    .option('--null-draws <b>', 'copies of the new runs simulated under the old model to calibrate p-values; 0 = quick uncalibrated screen', String(DEFAULT_NULL_DRAWS))
    .option('--robust <eps>', 'extra starts of the re-fit: for each ε, EM whose readings are uninformative with probability ε, then plain EM; "none" for the plain warm start only', DEFAULT_REFIT_SEARCH.robust.join(','))
    .option('--swap-rounds <n>', 'rounds of moving a detected change to a look-alike cell nearby when that fits better (0 = none)', String(DEFAULT_REFIT_SEARCH.swapRounds))
    .option('--transitions <mode>', 'fixed | tied | learned for the re-fit', 'tied')
    .option('--prior-strength <w>', 'pseudo-readings per cell pulling the re-fit towards the old rows', '10')
    .option('--max-iter <n>', 'most EM iterations of the re-fit', '200')
    .option('--tol <x>', 'relative change of log-likelihood per reading that counts as converged', '1e-6')
    .option('--seed <s>', 'seed of the null draws', '1')
    .option('--workers <n>', 'threads for the E-step, the main one included (default: the number of cores)');
  addKeyColumnOptions(cmd);
  addCompressionOption(cmd);
  addOutputOptions(cmd);
  cmd.action(async (opts: Record<string, unknown>) => {
    const config = compareConfig(opts);
    const progress = compareProgress(io, Boolean(opts.quiet));
    let res: CompareOutcome;
    try {
      // Loaded when used: the statistics libraries need not load for other commands.
      const { compareFromFiles } = await import('../pipeline/compare-from-files.js');
      res = await compareFromFiles(config, progress.onProgress);
    } finally {
      progress.done();
    }
    for (const w of res.warnings) io.err(`warning: ${w}\n`);
    if (opts.json) {
      io.out(`${JSON.stringify({ changed: res.nChanged, changesReported: res.nRegionsChanged, placed: res.nPlaced, tested: res.nTested, tooFewReadings: res.nTooFew, nullDraws: res.nullDraws, inflation: res.inflation, beforePerReading: res.beforePerReading, afterPerReading: res.afterPerReading, changes: res.changes, regions: res.regions })}\n`);
      return;
    }
    io.out(formatCompareSummary(res, config));
  });
}

/** Flags → checked compare config (pure). */
export function compareConfig(opts: Record<string, unknown>): CompareConfig {
  const { compare, fit, workers, nullDraws, search } = resolveCompareOptions(opts, 'compare');
  return {
    model: String(opts.model),
    floor: String(opts.floor),
    runs: opts.runs as string[],
    out: String(opts.out),
    refit: opts.refit ? String(opts.refit) : null,
    writeFloor: opts.writeFloor ? String(opts.writeFloor) : null,
    compare,
    fit,
    workers,
    nullDraws,
    search,
    keys: keyColumnsFrom(opts, 'compare'),
  };
}

export function formatCompareSummary(res: CompareOutcome, config: Pick<CompareConfig, 'out' | 'refit' | 'writeFloor' | 'compare'>): string {
  const lines = [
    `${res.nChanged} of ${res.nTested} tested cells changed at false-discovery rate ${config.compare.fdr} (${res.nTooFew} cells had fewer than ${config.compare.minReadings} expected readings: not tested)`,
    res.nullDraws > 0
      ? `p-values from ${res.nullDraws} copies of the new runs simulated under the old model (no change); median null scale ${res.inflation.toFixed(2)} × chi-square (expected counts carry less information than plain counts)`
      : `quick screen (--null-draws 0): G statistics divided by ${res.inflation.toFixed(2)} (median calibration); p-values not calibrated`,
    `new runs: log-likelihood per reading ${res.beforePerReading.toFixed(4)} under the old model, ${res.afterPerReading.toFixed(4)} after re-fitting (shift ${(res.afterPerReading - res.beforePerReading >= 0 ? '+' : '') + (res.afterPerReading - res.beforePerReading).toFixed(4)})`,
  ];
  if (res.nRegionsChanged > 0) {
    lines.push(
      `${res.nRegionsChanged} reported change${res.nRegionsChanged === 1 ? '' : 's'} (false-discovery rate controlled over changes): ${res.nPlaced} placed on one cell, ${res.unplaced.length} in regions of cells the runs cannot tell apart (look-alike cells near each other; column candidates)`,
    );
  }
  const strongest = res.changes.filter((c) => c.verdict === 'changed' && c.candidates[0] === c.cell).slice(0, 10);
  if (strongest.length) {
    lines.push('', 'strongest changes:');
    lines.push(
      formatTable(
        ['region', 'cell', 'before', 'after', 'readings', 'TV', 'q', 'candidates'],
        strongest.map((c) => [
          c.region,
          c.cell,
          c.surfaceBefore,
          c.surfaceAfter,
          Math.round(c.expectedReadings),
          c.tvDistance.toFixed(3),
          (c.qValue ?? 1).toExponential(1),
          c.candidates.length === 1 ? '(placed)' : `${c.candidates.length} cells: ${c.candidates.slice(0, 4).join(';')}${c.candidates.length > 4 ? ';…' : ''}`,
        ]),
      ).trimEnd(),
    );
    lines.push('', 'why:');
    for (const c of strongest) lines.push(`  ${c.region} ${c.cell}: ${c.explanation}`);
  }
  if (config.writeFloor && res.unplaced.length) {
    lines.push('', `not written to ${config.writeFloor} (the change could be at any of these cells; inspect them):`);
    for (const r of res.unplaced) lines.push(`  ${r.region}: ${r.cells.join(';')}`);
  }
  lines.push('');
  if (config.out) lines.push(`wrote ${config.out}`);
  if (config.refit) lines.push(`wrote ${config.refit}`);
  if (config.writeFloor) lines.push(`wrote ${config.writeFloor}`);
  lines.push(COMPARE_CAUTION);
  return `${lines.join('\n')}\n`;
}
