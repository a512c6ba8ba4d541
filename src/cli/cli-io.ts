/** Where the CLI writes: injectable so tests can run commands in-process. */
export interface CliIo {
  out(text: string): void;
  err(text: string): void;
  /** True when stderr is a terminal (progress is drawn only then). */
  errIsTty: boolean;
}

export const processIo: CliIo = {
  out: (t) => process.stdout.write(t),
  err: (t) => process.stderr.write(t),
  errIsTty: Boolean(process.stderr.isTTY),
};
