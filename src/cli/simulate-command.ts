import { InputError } from '../errors.js';
import type { Command } from 'commander';
import { simulateToFile, type SimulateConfig } from '../pipeline/simulate-to-file.js';
import { addCompressionOption, addOutputOptions, numberOption } from './common-options.js';
import { setStdioTableFormat, setTableCompression } from '../pipeline/table-options.js';
import type { CliIo } from './cli-io.js';

export function registerSimulate(program: Command, io: CliIo): void {
  const cmd = program
    .command('simulate')
    .description('generate runs (with a true_cell column) from a model, or from the floor\'s surveyed surfaces')
    .requiredOption('--floor <file>', 'floor file')
    .option('--model <file>', 'model to simulate from (default: the floor with --hit and --dwell)')
    .requiredOption('--runs <n>', 'number of runs')
    .requiredOption('--steps <n>', 'steps per run')
    .option('--seed <n>', 'random seed', '1')
    .requiredOption('--out <file>', 'runs table to write (.csv, .arrow, .arrows)')
    .option('--hit <p>', 'without --model: probability of reading the surveyed surface', '0.8')
    .option('--dwell <p>', 'without --model: probability of staying in the same cell per step', '0.5')
    .option('--dropout-rate <p>', 'probability that a reading is empty', '0')
    .option('--gap-rate <p>', 'probability that a step is lost (row missing)', '0')
    .option('--odometry', 'write wheel-odometry columns (always done when the model has movement parameters)')
    .option('--moved-col <name>', 'name of the odometry distance column', 'moved')
    .option('--heading-col <name>', 'name of the odometry heading column', 'heading')
    .option('--format <name>', 'format of the table written to standard output (--out -): csv, arrow, arrows');
  addCompressionOption(cmd);
  addOutputOptions(cmd);
  cmd.action(async (opts: Record<string, unknown>) => {
    const config = simulateConfig(opts);
    const res = await simulateToFile(config);
    if (opts.json) io.out(`${JSON.stringify({ out: config.out, ...res })}\n`);
    else io.out(`wrote ${config.out}: ${res.nRuns} runs, ${res.nRows} rows (${res.nDropouts} dropouts, ${res.nGaps} lost steps), simulated from the ${res.source}\n`);
  });
}

/** The most rows one `simulate` writes (10^8: a few GB of CSV; larger sets: several runs of the command). */
export const MAX_SIMULATED_ROWS = 100_000_000;

/** Flags → checked simulate config (pure). */
export function simulateConfig(opts: Record<string, unknown>): SimulateConfig {
  const w = 'simulate';
  setStdioTableFormat(typeof opts.format === 'string' ? opts.format : null, w);
  setTableCompression(typeof opts.compression === 'string' ? opts.compression : null, w);
  const int = (k: string, flag: string, min: number, max: number) =>
    numberOption(opts[k], w, flag, (x) => Number.isInteger(x) && x >= min && x <= max, `a whole number from ${min} to ${max}`);
  const prob = (k: string, flag: string, ok: (x: number) => boolean, req: string) => numberOption(opts[k], w, flag, ok, req);
  const runs = int('runs', '--runs', 1, 1_000_000);
  const steps = int('steps', '--steps', 1, MAX_SIMULATED_ROWS);
  if (runs * steps > MAX_SIMULATED_ROWS) {
    throw new InputError(`${w}: --runs × --steps must be at most ${MAX_SIMULATED_ROWS} rows, got ${runs} × ${steps} = ${runs * steps}`);
  }
  return {
    floor: String(opts.floor),
    model: opts.model ? String(opts.model) : null,
    runs,
    steps,
    seed: int('seed', '--seed', 0, 2 ** 31 - 1),
    out: String(opts.out),
    hit: prob('hit', '--hit', (x) => x > 0 && x <= 1, 'a probability in (0, 1]'),
    dwell: prob('dwell', '--dwell', (x) => x > 0 && x < 1, 'a probability strictly between 0 and 1'),
    dropoutRate: prob('dropoutRate', '--dropout-rate', (x) => x >= 0 && x < 1, 'a probability in [0, 1)'),
    gapRate: prob('gapRate', '--gap-rate', (x) => x >= 0 && x < 1, 'a probability in [0, 1)'),
    odometry: opts.odometry === true,
    movedCol: String(opts.movedCol ?? 'moved'),
    headingCol: String(opts.headingCol ?? 'heading'),
  };
}
