import { INTERRUPT_EXIT_CODES, type InterruptSignal } from '../errors.js';
import { removeTemporaryFiles } from '../pipeline/temporary-files.js';
import type { CliIo } from './cli-io.js';

/** The stop request of the operation that can stop cleanly (a fit), if one is running. */
let cooperative: AbortController | null = null;

/**
 * SIGINT and SIGTERM, handled alike. While a fit runs (`cooperativeStop`), the first signal asks it to
 * stop after the current iteration (its checkpoint saved); the command then ends with the interrupt
 * error (exit 130 for SIGINT, 143 for SIGTERM). Any other time, or on a second signal, the process
 * removes its temporary files and ends at once by the signal itself (the shell's status is then the same
 * 130 or 143): outputs not yet renamed into place
 * are not written, and files written before stay whole (every write is atomic). A closed stdout or
 * stderr (EPIPE, e.g. `check --json | head -c 10`) ends the process quietly. On every exit the
 * temporary files of unfinished writes are removed.
 */
export function installInterruptHandlers(io: CliIo): void {
  let signals = 0;
  const onSignal = (signal: InterruptSignal): void => {
    signals++;
    if (cooperative && signals === 1) {
      // Silent: the command's one error line says what happened and how to resume.
      cooperative.abort(signal);
      return;
    }
    removeTemporaryFiles();
    io.err(`underfoot: stopped by ${signal}; outputs not finished were not written (exit ${INTERRUPT_EXIT_CODES[signal]})\n`);
    // Die of the signal itself (the shell reports 128 + its number): `process.exit` would wait for
    // file-system work blocked in the thread pool (e.g. opening a FIFO nobody writes) and never end.
    process.removeListener('SIGINT', onSigint);
    process.removeListener('SIGTERM', onSigterm);
    process.kill(process.pid, signal);
  };
  const onSigint = (): void => onSignal('SIGINT');
  const onSigterm = (): void => onSignal('SIGTERM');
  process.on('SIGINT', onSigint);
  process.on('SIGTERM', onSigterm);
  process.on('exit', removeTemporaryFiles);
  for (const stream of [process.stdout, process.stderr]) {
    stream.on('error', (err: NodeJS.ErrnoException) => {
      if (err.code !== 'EPIPE') throw err;
      removeTemporaryFiles();
      process.exit(typeof process.exitCode === 'number' ? process.exitCode : 0);
    });
  }
}

/** Marks an operation that stops cleanly on request; returns its signal. Call `endCooperativeStop` after. */
export function cooperativeStop(): AbortSignal {
  cooperative = new AbortController();
  return cooperative.signal;
}

export function endCooperativeStop(): void {
  cooperative = null;
}
