import type { Command } from 'commander';
import { DEFAULT_KEY_COLUMNS, type KeyColumns } from '../pipeline/key-columns.js';
import { InputError, quote } from '../errors.js';
import { parsePeriod, setStdioTableFormat, setTableCompression } from '../pipeline/table-options.js';

/** Adds the runs-table column options shared by commands that read runs. */
export function addKeyColumnOptions(cmd: Command, movement = true): Command {
  cmd
    .option('--run-col <name>', 'column holding the run id', DEFAULT_KEY_COLUMNS.runCol)
    .option('--step-col <name>', 'column holding the step number', DEFAULT_KEY_COLUMNS.stepCol)
    .option('--reading-col <name>', 'column holding the reading', DEFAULT_KEY_COLUMNS.readingCol)
    .option('--time-col <name>', 'column holding the time of each reading (seconds, ISO 8601 text or an Arrow timestamp), mapped to steps instead of --step-col')
    .option('--period <duration>', 'sampling period with --time-col, e.g. 100ms or 0.5s (default: the median spacing, printed)')
    .option('--format <name>', 'format of a table read from standard input or written to standard output ("-"): csv, arrow, arrows')
    .option('--unknown-readings <mode>', 'a reading not in the floor\'s surfaces: "error" or "dropout"', 'error');
  if (!movement) return cmd;
  return cmd
    .option('--moved-col <name>', 'column holding the metres moved since the previous row (odometry; used when present)', undefined)
    .option('--heading-col <name>', 'column holding the heading of travel in degrees (odometry; used when present)', undefined);
}

export function keyColumnsFrom(opts: Record<string, unknown>, where: string): KeyColumns {
  const mode = opts.unknownReadings;
  if (mode !== 'error' && mode !== 'dropout') throw new InputError(`${where}: --unknown-readings must be "error" or "dropout", got ${quote(mode)}`);
  setStdioTableFormat(typeof opts.format === 'string' ? opts.format : null, where);
  setTableCompression(typeof opts.compression === 'string' ? opts.compression : null, where);
  const keys: KeyColumns = { runCol: String(opts.runCol), stepCol: String(opts.stepCol), readingCol: String(opts.readingCol), unknownReadings: mode };
  if (typeof opts.movedCol === 'string') keys.movedCol = opts.movedCol;
  if (typeof opts.headingCol === 'string') keys.headingCol = opts.headingCol;
  if (typeof opts.timeCol === 'string') keys.timeCol = opts.timeCol;
  if (opts.period !== undefined) {
    if (keys.timeCol === undefined) throw new InputError(`${where}: --period must come with --time-col, got --period ${quote(opts.period)} alone`);
    const period = parsePeriod(opts.period);
    if (Number.isNaN(period)) throw new InputError(`${where}: --period must be a duration > 0 in ms or s (e.g. 100ms, 0.5s), got ${quote(opts.period)}`);
    keys.period = period;
  }
  return keys;
}

/** Adds --compression, for commands that write tables (read by `keyColumnsFrom`, or `setTableCompression`). */
export function addCompressionOption(cmd: Command): Command {
  return cmd.option('--compression <codec>', 'compress Arrow outputs (zstd or lz4) or Parquet outputs (zstd); none = uncompressed', 'none');
}

/** Adds --quiet, --json and --debug. */
export function addOutputOptions(cmd: Command, json = true): Command {
  cmd.option('-q, --quiet', 'print nothing but errors');
  if (json) cmd.option('--json', 'print the result as JSON on stdout (for scripts); errors as JSON on stderr');
  return cmd.option('--debug', 'print stack traces of errors');
}

/** A number option, checked: one clear line when it is not a number in range. */
export function numberOption(value: unknown, where: string, flag: string, ok: (x: number) => boolean, requirement: string): number {
  const x = typeof value === 'number' ? value : typeof value === 'string' && value.trim() !== '' ? Number(value) : NaN;
  if (!Number.isFinite(x) || !ok(x)) throw new InputError(`${where}: ${flag} must be ${requirement}, got ${quote(value)}`);
  return x;
}
