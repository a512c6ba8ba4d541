import type { FitProgress, QueueWait } from '../pipeline/cli-surface.js';
import type { CompareProgress } from '../pipeline/compare-from-files.js';
import type { CliIo } from './cli-io.js';

/** Any EM loop's progress event: where it is (`describe` names it), the iteration and the objective. */
type LoopProgress = { iteration: number; objectivePerReading: number };

/**
 * A one-line progress display on stderr, redrawn in place at most every 100 ms; silent unless stderr
 * is a terminal and `--quiet` is off. Returns the callback and a function that clears the line.
 */
function lineProgress<P extends LoopProgress>(io: CliIo, quiet: boolean, describe: (p: P) => string): { onProgress?: (p: P) => void; done: () => void } {
  if (quiet || !io.errIsTty) return { done: () => {} };
  let last = 0;
  let drawn = false;
  return {
    onProgress: (p) => {
      const now = Date.now();
      if (now - last < 100 && p.iteration !== 0) return;
      last = now;
      drawn = true;
      io.err(`\r\x1b[2K${describe(p)} · iteration ${p.iteration} · objective ${p.objectivePerReading.toFixed(6)} per reading`);
    },
    done: () => {
      if (drawn) io.err('\r\x1b[2K');
    },
  };
}

function describeFit(p: FitProgress): string {
  return p.phase === 'restart' ? `restart ${p.restart + 1} of ${p.restarts}` : `final pass (restart ${p.restart + 1}, all runs)`;
}

/** `fit`'s progress: which restart or the final pass. */
export function fitProgress(io: CliIo, quiet: boolean): { onProgress?: (p: FitProgress) => void; done: () => void } {
  return lineProgress(io, quiet, describeFit);
}

/** `compare`'s progress (the re-fit of the new runs, then each null draw's re-fit), or a plain fit's. */
export function compareProgress(io: CliIo, quiet: boolean): { onProgress?: (p: CompareProgress | FitProgress) => void; done: () => void } {
  return lineProgress<CompareProgress | FitProgress>(io, quiet, (p) => {
    if (!('draw' in p)) return describeFit(p);
    const data = p.draw === 0 ? 're-fit of the new runs' : `null draw ${p.draw} of ${p.draws} (simulated, no change)`;
    const stage = p.stage === 'plain' ? 'warm start' : p.stage === 'robust' ? `robust start ε ${p.robust}` : p.stage === 'fresh' ? 'fresh start' : 'swap search';
    return `${data} · ${stage}`;
  });
}

/** `fit --queue`'s wait for workers: one line each time the queue has been idle a while (not under --quiet). */
export function queueWaitLine(io: CliIo, where: string): (wait: QueueWait) => void {
  return (w) =>
    io.err(
      `${io.errIsTty ? '\r\x1b[2K' : ''}${where}: waiting for workers on ${w.queue}: ${w.done} of ${w.total} blocks done, none taken or finished for ${w.idleSeconds} s (start one with: underfoot worker --queue ${w.queue})\n`,
    );
}
