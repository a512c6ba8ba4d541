import type { Command } from 'commander';
import { fitFromFiles, type FitConfig } from '../pipeline/fit-from-files.js';
import { resolveFitOptions } from '../pipeline/resolve-fit-options.js';
import type { ModelFile } from '../pipeline/cli-surface.js';
import { addKeyColumnOptions, addOutputOptions, keyColumnsFrom } from './common-options.js';
import type { CliIo } from './cli-io.js';
import { fitProgress, queueWaitLine } from './progress.js';
import { formatTable } from './format-table.js';
import { InterruptedError } from '../errors.js';
import { cooperativeStop, endCooperativeStop } from './interrupts.js';

export function registerFit(program: Command, io: CliIo): void {
  const cmd = program
    .command('fit')
    .description('calibrate each cell\'s reading table from unlabelled runs (multi-restart Baum-Welch)')
    .requiredOption('--floor <file>', 'floor file')
    .requiredOption('--runs <files...>', 'runs tables')
    .requiredOption('--out <file>', 'model file to write')
    .option('--restarts <k>', 'EM restarts', '8')
    .option('--holdout <f>', 'fraction of runs held out (whole runs) to choose the restart', '0.2')
    .option('--holdout-col <col>', 'column whose value "held-out" marks held-out runs (instead of --holdout)')
    .option('--seed <s>', 'master seed', '1')
    .option('--transitions <mode>', 'auto | fixed | tied | per-cell | learned; auto fits fixed, tied, per-cell and learned (only fixed and tied when the runs carry odometry; restarts shared out among them, at least one each) and keeps the best held-out', 'auto')
    .option('--dwell <d>', 'starting (or fixed) dwell probability', '0.5')
    .option('--hit <p>', 'prior probability that a cell reads as its surveyed surface', '0.8')
    .option('--prior-strength <w>', 'pseudo-readings per cell behind the survey prior (0 = maximum likelihood)', '10')
    .option('--transition-prior-strength <w>', 'pseudo-transitions per cell behind the per-cell and learned transition priors, centred on --dwell with links equal (0 = maximum likelihood)', '20')
    .option('--max-iter <n>', 'most EM iterations per restart', '1000')
    .option('--tol <x>', 'relative change of log-likelihood per reading that counts as converged', '1e-6')
    .option('--prune <eps>', 'pruned E-step: drop at each step the least likely cells, at most this share of the forward mass (0 = exact; e.g. 1e-6)')
    .option('--workers <n>', 'threads for the E-step, the main one included (default: the number of cores)')
    .option('--no-final-pass', 'skip continuing the chosen restart on all runs')
    .option('--from <model>', 'start from an existing model (warm start, for re-fits)')
    .option('--checkpoint <dir>', 'save the fit after every iteration in this folder; the same command resumes it')
    .option('--queue <url>', 'run the E-steps on workers through Redis (redis://[user:password@]HOST:PORT; password also from UNDERFOOT_REDIS_PASSWORD); start workers with underfoot worker --queue URL')
    .option('--queue-timeout <s>', 'with --queue: stop when no worker takes or finishes a block for this many seconds (default: wait, with a line every 10 s)');
  addKeyColumnOptions(cmd);
  addOutputOptions(cmd);
  cmd.action(async (opts: Record<string, unknown>) => {
    const config = fitConfig(opts);
    const progress = fitProgress(io, Boolean(opts.quiet));
    const signal = cooperativeStop();
    let outcome: Awaited<ReturnType<typeof fitFromFiles>>;
    try {
      outcome = await fitFromFiles({ ...config, signal, onQueueWait: queueWaitLine(io, 'fit') }, progress.onProgress);
    } catch (err) {
      if (err instanceof InterruptedError) {
        throw new InterruptedError(
          config.checkpoint
            ? `fit interrupted (${err.signal}); the checkpoint in ${config.checkpoint} is complete: run the same command again to resume`
            : `fit interrupted (${err.signal}); nothing was written (use --checkpoint DIR to make long fits resumable)`,
          err.signal,
        );
      }
      throw err;
    } finally {
      endCooperativeStop();
      progress.done();
    }
    for (const w of outcome.warnings) io.err(`warning: ${w}\n`);
    if (opts.json) io.out(`${JSON.stringify({ out: config.out, name: outcome.file.name, fit: outcome.file.fit })}\n`);
    else io.out(formatFitSummary(outcome.file, config.out));
  });
}

/** Flags → checked fit config (pure). */
export function fitConfig(opts: Record<string, unknown>): FitConfig {
  const raw = { ...opts, finalPass: opts.finalPass === undefined ? undefined : Boolean(opts.finalPass) };
  const { options, workers, from, queue } = resolveFitOptions(raw, 'fit');
  return {
    floor: String(opts.floor),
    runs: opts.runs as string[],
    out: String(opts.out),
    from,
    options,
    workers,
    keys: keyColumnsFrom(opts, 'fit'),
    checkpoint: opts.checkpoint ? String(opts.checkpoint) : null,
    queue,
  };
}

/** The restarts table and the chosen model, as printed after a fit. */
export function formatFitSummary(file: ModelFile, out: string): string {
  const fit = file.fit!;
  const byMode = fit.restarts.some((r) => r.mode !== undefined);
  const rows = fit.restarts.map((r, k) => [
    k === fit.selected ? `${k + 1} *` : String(k + 1),
    ...(byMode ? [r.mode ?? ''] : []),
    r.seed,
    r.iterations,
    r.stopReason,
    r.trainLogLikPerReading.toFixed(5),
    r.heldOutLogLikPerReading === null ? '—' : r.heldOutLogLikPerReading.toFixed(5),
  ]);
  const chosenMode = byMode ? `, transitions ${fit.restarts[fit.selected].mode}` : '';
  const lines = [
    `${file.name}: ${file.model.cells.length} cells, ${fit.split.fit.length} runs fitted, ${fit.split.heldOut.length} held out (${fit.nReadings.fit} + ${fit.nReadings.heldOut} readings)`,
    '',
    formatTable(['restart', ...(byMode ? ['mode'] : []), 'seed', 'iterations', 'stop', 'train loglik/reading', 'held-out loglik/reading'], rows).trimEnd(),
    '',
    `chosen: restart ${fit.selected + 1}${chosenMode} (best ${fit.selectedBy === 'held-out' ? 'held-out' : 'training'} log-likelihood per reading)`,
  ];
  if (fit.finalPass) {
    lines.push(`final pass on all runs: ${fit.finalPass.iterations} iterations, ${fit.finalPass.stopReason}, loglik/reading ${fit.finalPass.trainLogLikPerReading.toFixed(5)}`);
  }
  const cal = fit.predictiveCalibration;
  if (cal) {
    lines.push(
      '',
      `forecast calibration on the held-out runs (chosen restart, most likely next reading at each step):\nexpected calibration error ${cal.ece.toFixed(4)} over ${cal.nReadings} readings`,
      formatTable(
        ['forecast p', 'forecasts', 'mean forecast', 'came true'],
        cal.bins.filter((b) => b.count > 0).map((b) => [`${b.lower.toFixed(1)}–${b.upper.toFixed(1)}`, b.count, b.meanPredicted!.toFixed(3), b.observed!.toFixed(3)]),
      ).trimEnd(),
    );
  }
  lines.push(`wrote ${out}`);
  return `${lines.join('\n')}\n`;
}
