/**
 * The two kinds of error the tool reports (DEVELOPERS.md, "Errors"): bad input or usage (exit 2) and failure
 * while working (exit 1). Messages follow "<where>: <thing> must <requirement>, got <actual>" and are
 * one line; the CLI prints only the message unless `--debug` is given.
 */
export class InputError extends Error {
  readonly exitCode = 2;
  constructor(message: string) {
    super(message);
    this.name = 'InputError';
  }
}

export class WorkError extends Error {
  readonly exitCode = 1;
  constructor(message: string) {
    super(message);
    this.name = 'WorkError';
  }
}

/** Quotes a value for an error message, shortening long values so the message stays one line. */
export function quote(value: unknown): string {
  let text: string;
  if (value === undefined) text = 'nothing';
  else if (typeof value === 'string') text = JSON.stringify(value.length > 200 ? value.slice(0, 200) : value);
  else {
    try {
      text = JSON.stringify(value) ?? String(value);
    } catch {
      text = String(value);
    }
  }
  text = text.replace(/[\r\n]+/g, ' ');
  return text.length > 80 ? `${text.slice(0, 77)}...` : text;
}

/** The signals that stop a command cleanly, and their exit codes (128 + signal number, the shell's convention). */
export const INTERRUPT_EXIT_CODES = { SIGINT: 130, SIGTERM: 143 } as const;
export type InterruptSignal = keyof typeof INTERRUPT_EXIT_CODES;

/**
 * The one interrupt error: a long operation stopped on request (SIGINT → exit 130, SIGTERM → exit 143),
 * thrown by the fit's EM loop when its abort signal fires (the signal's reason names the signal).
 */
export class InterruptedError extends Error {
  readonly exitCode: number;
  constructor(
    message: string,
    readonly signal: InterruptSignal = 'SIGINT',
  ) {
    super(message);
    this.name = 'InterruptedError';
    this.exitCode = INTERRUPT_EXIT_CODES[signal] ?? 130;
  }
}

/**
 * True for the errors a runtime raises when memory or address space runs out: a refused ArrayBuffer or
 * typed array (RangeError), a worker thread stopped for want of memory. Such errors may come from a
 * worker thread, where they arrive as copies (so they are recognised by name and code, not by class).
 */
export function isOutOfMemory(err: unknown): boolean {
  const e = err as { name?: unknown; message?: unknown; code?: unknown } | null;
  if (e === null || typeof e !== 'object') return false;
  if (e.code === 'ERR_WORKER_OUT_OF_MEMORY') return true;
  return (
    (err instanceof RangeError || e.name === 'RangeError') &&
    /allocation failed|could not allocate|out of memory|invalid typed array length|invalid array buffer length/i.test(String(e.message))
  );
}

/** The one-line WorkError (exit 1) for an error that `isOutOfMemory` recognises. */
export function outOfMemoryError(err: unknown): WorkError {
  const why = String((err as { message?: unknown })?.message ?? err).replace(/\s+/g, ' ');
  return new WorkError(
    `memory: the work must fit in the memory this process may use, got an allocation refused (${why}); ` +
      'close other programs, use fewer --workers, or raise the limit (ulimit -v)',
  );
}
