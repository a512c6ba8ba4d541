import { WorkError, isOutOfMemory, outOfMemoryError } from '../errors.js';

/**
 * A worker thread's failure (the reason piscina rejects a job with: the worker's own error, copied
 * across threads, or one about the worker itself, such as `ERR_WORKER_OUT_OF_MEMORY`) as a one-line
 * WorkError: out of memory (`outOfMemoryError`), or what the worker said.
 */
export function workerFailure(reason: unknown): WorkError {
  if (isOutOfMemory(reason)) return outOfMemoryError(reason);
  const e = reason as { message?: unknown; code?: unknown } | null;
  const what = String(e?.message ?? reason).replace(/\s+/g, ' ');
  const code = e?.code ? `, ${String(e.code)}` : '';
  return new WorkError(`E-step worker: it must compute its share of the runs, got a failure (${what}${code})`);
}
