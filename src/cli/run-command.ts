import type { Command } from 'commander';

import { addOutputOptions, numberOption } from './common-options.js';
import type { CliIo } from './cli-io.js';
import { compareProgress, queueWaitLine } from './progress.js';
import { formatCompareSummary } from './compare-command.js';
import { formatFitSummary } from './fit-command.js';
import { formatDecodeSummary } from './decode-command.js';
import { cooperativeStop, endCooperativeStop } from './interrupts.js';
import { InterruptedError } from '../errors.js';

export function registerRun(program: Command, io: CliIo): void {
  const cmd = program
    .command('run')
    .description('run a whole pipeline from a pipeline file (read, fit or re-fit and compare, decode, write)')
    .argument('<pipeline>', 'pipeline file (underfoot-pipeline/1 JSON)')
    .option('--workers <n>', 'threads for the E-step, the main one included (overrides the pipeline file)');
  addOutputOptions(cmd);
  cmd.action(async (path: string, opts: Record<string, unknown>) => {
    const workers = opts.workers === undefined ? undefined : numberOption(opts.workers, 'run', '--workers', (x) => Number.isInteger(x) && x >= 1, 'a whole number ≥ 1');
    const progress = compareProgress(io, Boolean(opts.quiet));
    let res: Awaited<ReturnType<typeof import('../pipeline/run-pipeline.js').runPipeline>>;
    const signal = cooperativeStop();
    try {
      const { runPipeline } = await import('../pipeline/run-pipeline.js');
      res = await runPipeline(path, progress.onProgress, { workers, signal, onQueueWait: queueWaitLine(io, 'run') });
    } catch (err) {
      if (err instanceof InterruptedError) throw new InterruptedError(`pipeline interrupted (${err.signal}) during the fit; nothing more was written`, err.signal);
      throw err;
    } finally {
      endCooperativeStop();
      progress.done();
    }
    for (const w of res.warnings) io.err(`warning: ${w}\n`);
    if (opts.json) {
      io.out(
        `${JSON.stringify({
          written: res.written,
          fit: res.fit?.file.fit ?? null,
          compare: res.compare ? { changed: res.compare.nChanged, changesReported: res.compare.nRegionsChanged, placed: res.compare.nPlaced, tested: res.compare.nTested, tooFewReadings: res.compare.nTooFew, nullDraws: res.compare.nullDraws, changes: res.compare.changes, regions: res.compare.regions } : null,
          runs: res.decode?.decoded.summaries ?? null,
        })}\n`,
      );
      return;
    }
    if (res.fit) io.out(`${formatFitSummary(res.fit.file, res.written[0])}\n`);
    if (res.compare) io.out(formatCompareSummary(res.compare, { out: null, refit: null, writeFloor: null, compare: res.compare.options }));
    if (res.decode) io.out(`${formatDecodeSummary(res.decode, null, null).replace(/\n$/, '')}\n`);
    io.out(`wrote ${res.written.join(', ')}\n`);
  });
}
