import type { Command } from 'commander';
import type { ReportConfig, ReportOutcome } from '../pipeline/report-to-file.js';
import { DEFAULT_AMBIGUITY_OPTIONS, type AmbiguityOptions } from '../pipeline/cli-surface.js';
import { addKeyColumnOptions, addOutputOptions, keyColumnsFrom, numberOption } from './common-options.js';
import type { CliIo } from './cli-io.js';
import { SAFETY_NOTE } from './safety-note.js';

export function registerReport(program: Command, io: CliIo): void {
  const cmd = program
    .command('report')
    .description('write a self-contained HTML report: floor maps, restarts, emission heat map, ambiguity, runs')
    .requiredOption('--model <file>', 'model file')
    .requiredOption('--out <file>', 'HTML file to write (.html)')
    .option('--floor <file>', 'floor file to check the model against')
    .option('--annotated <file>', 'annotated table from decode (visit shares, decoding confidence)')
    .option('--summary <file>', 'run summary table from decode --summary (worst runs)')
    .option('--changes <file>', 'changes table from compare (changed cells on the map)')
    .option('--sim-runs <n>', 'runs simulated to rate localization ambiguity', String(DEFAULT_AMBIGUITY_OPTIONS.runs))
    .option('--sim-steps <t>', 'steps per simulated run (default: the median real run, else 400)')
    .option('--seed <s>', 'seed of the simulation', String(DEFAULT_AMBIGUITY_OPTIONS.seed))
    .option('--ambiguous-below <p>', 'a cell recovered less often than this is ambiguous', String(DEFAULT_AMBIGUITY_OPTIONS.threshold));
  addKeyColumnOptions(cmd, false);
  addOutputOptions(cmd);
  cmd.action(async (opts: Record<string, unknown>) => {
    const config = reportConfig(opts);
    // Loaded when used: the chart libraries need not load for other commands.
    const { reportToFile } = await import('../pipeline/report-to-file.js');
    const res = await reportToFile(config);
    for (const w of res.warnings) io.err(`warning: ${w}\n`);
    if (opts.json) io.out(`${JSON.stringify(reportJson(res))}\n`);
    else io.out(formatReportSummary(res));
  });
}

/** Flags → checked report config (pure). */
export function reportConfig(opts: Record<string, unknown>): ReportConfig {
  const ambiguity: Partial<AmbiguityOptions> = {
    runs: numberOption(opts.simRuns, 'report', '--sim-runs', (x) => Number.isInteger(x) && x >= 1 && x <= 100_000, 'a whole number from 1 to 100000'),
    seed: numberOption(opts.seed, 'report', '--seed', (x) => Number.isInteger(x) && x >= 0 && x <= 2 ** 31 - 1, 'a whole number from 0 to 2147483647'),
    threshold: numberOption(opts.ambiguousBelow, 'report', '--ambiguous-below', (x) => x > 0 && x <= 1, 'a probability in (0, 1]'),
  };
  if (opts.simSteps !== undefined) {
    ambiguity.steps = numberOption(opts.simSteps, 'report', '--sim-steps', (x) => Number.isInteger(x) && x >= 1 && x <= 1_000_000, 'a whole number from 1 to 1000000');
  }
  const path = (v: unknown): string | null => (typeof v === 'string' && v !== '' ? v : null);
  return {
    model: String(opts.model),
    out: String(opts.out),
    floor: path(opts.floor),
    annotated: path(opts.annotated),
    summary: path(opts.summary),
    changes: path(opts.changes),
    keys: keyColumnsFrom(opts, 'report'),
    ambiguity,
  };
}

function reportJson(res: ReportOutcome): Record<string, unknown> {
  const a = res.data.ambiguity;
  return {
    out: res.out,
    bytes: res.bytes,
    cells: res.data.modelFile.model.cells.length,
    disagreements: res.data.disagreements.map((d) => res.data.modelFile.model.cells[d.cell].id),
    ambiguity: {
      options: a.options,
      ambiguousCells: res.data.modelFile.model.cells.filter((_, i) => a.ambiguous[i]).map((c) => c.id),
    },
    runs: res.data.runRows?.length ?? null,
  };
}

export function formatReportSummary(res: ReportOutcome): string {
  const d = res.data;
  const a = d.ambiguity;
  const rated = Array.from(a.visits).filter((v) => v >= a.options.minVisits).length;
  const ambiguous = a.ambiguous.reduce((s, x) => s + x, 0);
  return `${[
    `report: ${d.modelFile.model.cells.length} cells, ${d.disagreements.length} ${d.disagreements.length === 1 ? 'reads' : 'read'} unlike the survey, ${ambiguous} of ${rated} rated cells ambiguous (${a.options.runs} simulated runs of ${a.options.steps} steps, seed ${a.options.seed})${d.runRows ? `, ${d.runRows.length} runs ranked` : ''}`,
    `wrote ${res.out} (${Math.round(res.bytes / 1024)} KiB)`,
    SAFETY_NOTE,
  ].join('\n')}\n`;
}
