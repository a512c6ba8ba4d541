import type { Command } from 'commander';
import { decodeFromFiles, type DecodeConfig, type DecodeOutcome } from '../pipeline/decode-from-files.js';
import { DEFAULT_THRESHOLDS } from '../pipeline/cli-surface.js';
import { resolveDecodeOptions } from '../pipeline/resolve-decode-options.js';
import { addCompressionOption, addKeyColumnOptions, addOutputOptions, keyColumnsFrom } from './common-options.js';
import type { CliIo } from './cli-io.js';
import { SAFETY_NOTE } from './safety-note.js';

export function registerDecode(program: Command, io: CliIo): void {
  const cmd = program
    .command('decode')
    .description('decode runs: most likely path (Viterbi) and per-step posteriors, as an annotated table')
    .requiredOption('--model <file>', 'model file')
    .requiredOption('--runs <files...>', 'runs tables')
    .requiredOption('--out <file>', 'annotated table to write (.csv, .arrow, .arrows, .parquet, .geojson)')
    .option('--summary <file>', 'run summary table to write')
    .option('--floor <file>', 'floor file to check the model against')
    .option('--low-confidence <p>', 'flag steps whose path cell has posterior below this', String(DEFAULT_THRESHOLDS.lowConfidence))
    .option('--surprising-bits <b>', 'flag readings more surprising than this many bits', String(DEFAULT_THRESHOLDS.surprisingBits))
    .addHelpText(
      'after',
      '\nlikely_p and path_p are posterior probabilities under the model: they mean what they say\n' +
        'only as far as the model describes the building and the robot. fit records a label-free\n' +
        'check of its reading forecasts (predictiveCalibration in the model file, printed by fit,\n' +
        'drawn by report); README.md, "What likely_p means", gives the calibration measured against\n' +
        'known positions.',
    );
  addKeyColumnOptions(cmd);
  addCompressionOption(cmd);
  addOutputOptions(cmd);
  cmd.action(async (opts: Record<string, unknown>) => {
    const config = decodeConfig(opts);
    const res = await decodeFromFiles(config);
    for (const w of res.warnings) io.err(`warning: ${w}\n`);
    if (opts.json) io.out(`${JSON.stringify({ out: config.out, summary: config.summary, runs: res.decoded.summaries })}\n`);
    else io.out(formatDecodeSummary(res, config.out, config.summary));
  });
}

/** Flags → checked decode config (pure). */
export function decodeConfig(opts: Record<string, unknown>): DecodeConfig {
  return {
    model: String(opts.model),
    floor: opts.floor ? String(opts.floor) : null,
    runs: opts.runs as string[],
    out: String(opts.out),
    summary: opts.summary ? String(opts.summary) : null,
    thresholds: resolveDecodeOptions({ lowConfidence: opts.lowConfidence, surprisingBits: opts.surprisingBits }, 'decode'),
    keys: keyColumnsFrom(opts, 'decode'),
  };
}

export function formatDecodeSummary(res: DecodeOutcome, out: string | null, summary: string | null): string {
  const s = res.decoded.summaries;
  const steps = s.reduce((a, r) => a + r.steps, 0);
  const low = s.reduce((a, r) => a + r.lowConfidenceSteps, 0);
  const surprising = s.reduce((a, r) => a + r.surprisingSteps, 0);
  const meanP = s.reduce((a, r) => a + (Number.isFinite(r.meanPathP) ? r.meanPathP * r.steps : 0), 0) / Math.max(1, steps);
  const lines = [
    `decoded ${res.nRuns} runs, ${steps} steps: mean path posterior ${meanP.toFixed(3)}, ${low} low-confidence steps (${((100 * low) / Math.max(1, steps)).toFixed(1)}%), ${surprising} surprising readings`,
  ];
  if (out) lines.push(`wrote ${out}`);
  if (summary) lines.push(`wrote ${summary}`);
  lines.push(SAFETY_NOTE);
  return `${lines.join('\n')}\n`;
}
