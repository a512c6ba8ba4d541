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

/** A long operation stopped on request (SIGINT): exit 130, the shell's convention for Ctrl-C. */
export class FitInterruptedError extends Error {
  readonly exitCode = 130;
  constructor(message: string) {
    super(message);
    this.name = 'FitInterruptedError';
  }
}
