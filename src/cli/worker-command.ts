import type { Command } from 'commander';
import type { CliIo } from './cli-io.js';
import { numberOption } from './common-options.js';
import { cooperativeStop, endCooperativeStop } from './interrupts.js';

export function registerWorker(program: Command, io: CliIo): void {
  program
    .command('worker')
    .description('compute fit blocks for fits started with --queue, until stopped (SIGINT/SIGTERM finish the blocks in hand)')
    .requiredOption('--queue <url>', 'the queue\'s Redis: redis://[user:password@]HOST:PORT[/DB] (password also from UNDERFOOT_REDIS_PASSWORD, user from UNDERFOOT_REDIS_USER)')
    .option('--concurrency <n>', 'blocks computed at once (threads)', '1')
    .option('--stall-seconds <s>', 'lock time of a block being computed; a block whose worker died is handed out again after about twice this', '30')
    .option('-q, --quiet', 'print nothing but errors')
    .option('--debug', 'print a stack trace with errors')
    .action(async (opts: Record<string, unknown>) => {
      const concurrency = numberOption(opts.concurrency, 'worker', '--concurrency', (x) => Number.isInteger(x) && x >= 1 && x <= 256, 'a whole number from 1 to 256');
      const stallSeconds = numberOption(opts.stallSeconds, 'worker', '--stall-seconds', (x) => x >= 1 && x <= 86_400, 'a number of seconds from 1 to 86400');
      const signal = cooperativeStop();
      try {
        const { serveQueue } = await import('../pipeline/serve-queue.js');
        const done = await serveQueue({ queue: String(opts.queue), concurrency, stallSeconds, signal, onLine: (line) => io.err(`worker: ${line}\n`) });
        io.err(`worker: stopped; ${done.blocks} blocks computed, ${done.refused} refused\n`);
      } finally {
        endCooperativeStop();
      }
    });
}
