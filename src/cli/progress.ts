import type { FitProgress } from '../fit/fit-model.js';
import type { CompareProgress } from '../pipeline/compare-from-files.js';
import type { CliIo } from './cli-io.js';

/**
 * A one-line progress display on stderr, redrawn in place; silent unless stderr is a terminal and
 * `--quiet` is off. Returns the callback and a function that clears the line.
 */
export function fitProgress(io: CliIo, quiet: boolean): { onProgress?: (p: FitProgress) => void; done: () => void } {
  if (quiet || !io.errIsTty) return { done: () => {} };
  let last = 0;
  let drawn = false;
  return {
    onProgress: (p) => {
      const now = Date.now();
      if (now - last < 100 && p.iteration !== 0) return;
      last = now;
      drawn = true;
      const what = p.phase === 'restart' ? `restart ${p.restart + 1} of ${p.restarts}` : `final pass (restart ${p.restart + 1}, all runs)`;
      io.err(`\r\x1b[2K${what} · iteration ${p.iteration} · objective ${p.objectivePerReading.toFixed(6)} per reading`);
    },
    done: () => {
      if (drawn) io.err('\r\x1b[2K');
    },
  };
}

/** `compare`'s progress (the re-fit of the new runs, then each null draw's re-fit), or a plain fit's. */
export function compareProgress(io: CliIo, quiet: boolean): { onProgress?: (p: CompareProgress | FitProgress) => void; done: () => void } {
  if (quiet || !io.errIsTty) return { done: () => {} };
  let last = 0;
  let drawn = false;
  return {
    onProgress: (p) => {
      const now = Date.now();
      if (now - last < 100 && p.iteration !== 0) return;
      last = now;
      drawn = true;
      let what: string;
      if (!('draw' in p)) {
        what = p.phase === 'restart' ? `restart ${p.restart + 1} of ${p.restarts}` : `final pass (restart ${p.restart + 1}, all runs)`;
      } else {
        const data = p.draw === 0 ? 're-fit of the new runs' : `null draw ${p.draw} of ${p.draws} (simulated, no change)`;
        const stage = p.stage === 'plain' ? 'warm start' : p.stage === 'robust' ? `robust start ε ${p.robust}` : 'swap search';
        what = `${data} · ${stage}`;
      }
      io.err(`\r\x1b[2K${what} · iteration ${p.iteration} · objective ${p.objectivePerReading.toFixed(6)} per reading`);
    },
    done: () => {
      if (drawn) io.err('\r\x1b[2K');
    },
  };
}
