import { InputError, quote } from '../errors.js';
import { listForMessage } from './list-for-message.js';
import type { ReadRunsOptions } from './runs-table.js';

/**
 * Picks the run, step and reading columns (`options` names them, defaults `run`, `step`, `reading`) out
 * of `names`; a missing one is an InputError that lists the columns present and the option to use.
 */
export function resolveKeyColumns(
  names: readonly string[],
  options: ReadRunsOptions,
  source: string,
): { runCol: string; stepCol: string; readingCol: string; timeCol?: string } {
  const picked = {
    runCol: options.runCol ?? 'run',
    stepCol: options.stepCol ?? 'step',
    readingCol: options.readingCol ?? 'reading',
    ...(options.timeCol !== undefined ? { timeCol: options.timeCol } : {}),
  };
  // With a time column, steps come from times: the step column need not exist.
  const roles = [
    ['run', picked.runCol, '--run-col'],
    picked.timeCol !== undefined ? ['time', picked.timeCol, '--time-col'] : ['step', picked.stepCol, '--step-col'],
    ['reading', picked.readingCol, '--reading-col'],
  ] as const;
  for (const [role, name, flag] of roles) {
    if (!names.includes(name)) {
      const present = listForMessage(names.map((n) => quote(n)), 20);
      throw new InputError(
        `${source}: the ${role} column must be present, got no column ${quote(name)} among ${present} (name another with ${flag})`,
      );
    }
  }
  for (let i = 0; i < roles.length; i++) {
    for (let j = i + 1; j < roles.length; j++) {
      if (roles[i][1] === roles[j][1]) {
        throw new InputError(
          `${source}: the ${roles[i][0]} and ${roles[j][0]} columns must differ, got ${quote(roles[i][1])} for both`,
        );
      }
    }
  }
  return picked;
}
