import { describe, it, expect } from 'vitest';
import { WorkError, isOutOfMemory } from '../../src/errors.js';
import { workerFailure } from '../../src/fit/worker-failure.js';

// The messages below are the ones Node 20 / V8 give (seen on this machine): a refused ArrayBuffer
// ("Array buffer allocation failed"), a refused WebAssembly memory, a worker stopped for want of memory
// (code ERR_WORKER_OUT_OF_MEMORY). Errors from a worker thread arrive as copies: plain objects with
// the original name, message and code.

describe('workerFailure(reason)', () => {
  it('turns out-of-memory reasons, thrown here or copied from a worker, into the one-line memory error', () => {
    const copied = Object.assign(new Error('Array buffer allocation failed'), { name: 'RangeError' });
    const stopped = Object.assign(new Error('Worker terminated due to reaching memory limit: JS heap out of memory'), { code: 'ERR_WORKER_OUT_OF_MEMORY' });
    for (const reason of [new RangeError('Array buffer allocation failed'), new RangeError('WebAssembly.Memory(): could not allocate memory'), copied, stopped]) {
      expect(isOutOfMemory(reason)).toBe(true);
      const err = workerFailure(reason);
      expect(err).toBeInstanceOf(WorkError);
      expect(err.exitCode).toBe(1);
      expect(err.message).toMatch(/^memory: the work must fit in the memory this process may use, got an allocation refused \(/);
      expect(err.message).not.toMatch(/[\r\n]/);
    }
  });

  it('names any other failure on one line, with its code', () => {
    const reason = Object.assign(new Error('Terminating worker\nthread'), { code: 'ERR_X' });
    expect(isOutOfMemory(reason)).toBe(false);
    expect(isOutOfMemory(new RangeError('Maximum call stack size exceeded'))).toBe(false);
    expect(workerFailure(reason).message).toBe('E-step worker: it must compute its share of the runs, got a failure (Terminating worker thread, ERR_X)');
  });
});
