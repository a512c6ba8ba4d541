import { Command, CommanderError } from 'commander';
import { InputError, WorkError, InterruptedError, isOutOfMemory, outOfMemoryError } from '../errors.js';
import { TOOL_VERSION } from '../version.js';
import { processIo, type CliIo } from './cli-io.js';

type Register = (program: Command, io: CliIo) => void;

/**
 * Each command's module, loaded only when needed (start-up time): a command named on the command line
 * loads its own module alone; help, a version request or an unknown command load them all.
 */
const COMMANDS: Record<string, () => Promise<Register>> = {
  check: async () => (await import('./check-command.js')).registerCheck,
  simulate: async () => (await import('./simulate-command.js')).registerSimulate,
  fit: async () => (await import('./fit-command.js')).registerFit,
  decode: async () => (await import('./decode-command.js')).registerDecode,
  run: async () => (await import('./run-command.js')).registerRun,
  report: async () => (await import('./report-command.js')).registerReport,
  compare: async () => (await import('./compare-command.js')).registerCompare,
  worker: async () => (await import('./worker-command.js')).registerWorker,
};

/**
 * Runs the command line and returns the exit code: 0 success, 1 failure while working, 2 bad input or
 * usage. Errors print one line on stderr (a stack trace only with --debug).
 */
export async function main(argv: string[], io: CliIo = processIo): Promise<number> {
  const flags = argv.slice(0, argv.includes('--') ? argv.indexOf('--') : argv.length);
  const json = flags.includes('--json');
  const quiet = flags.includes('-q') || flags.includes('--quiet');
  // A table written to standard output (`--out -` etc.) owns stdout: messages (and --json results) go
  // to stderr. --quiet prints nothing but errors (and a --json result).
  const stdoutIsData = flags.some((a, i) => (a === '-' && ['--out', '--summary', '--changes'].includes(flags[i - 1] ?? '')) || /^--(out|summary|changes)=-$/.test(a));
  const commandIo: CliIo = {
    out: quiet && !json ? () => {} : stdoutIsData ? io.err : io.out,
    err: quiet ? () => {} : io.err,
    errIsTty: io.errIsTty,
  };
  const printError = (message: string, code: number): void => {
    io.err(json ? `${JSON.stringify({ error: message, exit: code })}\n` : `underfoot: ${message}\n`);
  };
  const program = new Command();
  program
    .name('underfoot')
    .description('Calibrate and decode indoor robots\' floor-sensor readings with hidden Markov models over a surveyed floor graph.')
    .version(TOOL_VERSION)
    .exitOverride()
    .showHelpAfterError('(add --help for usage)')
    .configureOutput({ writeOut: (s) => io.out(s), writeErr: (s) => io.err(s) });
  // The command is the first word that is not an option (the program itself takes no option values).
  const named = flags.find((a) => !a.startsWith('-'));
  const versionOnly = named === undefined && (flags.includes('-V') || flags.includes('--version'));
  const wanted = named !== undefined && Object.hasOwn(COMMANDS, named) ? [named] : versionOnly ? [] : Object.keys(COMMANDS);
  for (const register of await Promise.all(wanted.map((name) => COMMANDS[name]()))) register(program, commandIo);
  for (const cmd of program.commands) cmd.exitOverride();
  const debug = argv.includes('--debug');
  try {
    await program.parseAsync(argv, { from: 'user' });
    return 0;
  } catch (err) {
    if (err instanceof CommanderError) {
      if (err.code === 'commander.helpDisplayed' || err.code === 'commander.version' || err.code === 'commander.help') return 0;
      return 2; // commander has already printed its one-line message
    }
    if (err instanceof InputError || err instanceof WorkError || err instanceof InterruptedError) {
      printError(err.message, err.exitCode);
      if (debug && err.stack) io.err(`${err.stack}\n`);
      return err.exitCode;
    }
    if (isOutOfMemory(err)) {
      printError(outOfMemoryError(err).message, 1);
      if (debug && (err as Error).stack) io.err(`${(err as Error).stack}\n`);
      return 1;
    }
    const e = err as Error;
    printError(`internal error: ${e?.message ?? String(err)}${debug ? '' : ' (run again with --debug for details)'}`, 1);
    if (debug && e?.stack) io.err(`${e.stack}\n`);
    return 1;
  }
}
