/**
 * The two kinds of error the tool reports (HOUSE-STYLE.md): bad input or usage (exit 2) and failure
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
  else if (typeof value === 'string') text = JSON.stringify(value);
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
