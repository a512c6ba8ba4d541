import { availableParallelism } from 'node:os';
import { InputError, quote } from '../errors.js';
import { optionReader } from './option-reader.js';
import { DEFAULT_FIT_OPTIONS, DEFAULT_TRANSITION_PRIOR_STRENGTH } from '../fit/fit-model.js';
import type { FitOptions, FitTransitions } from '../fit/fit-record.js';

/** `fit --queue URL [--queue-timeout S]`: run the E-steps on workers through Redis (see `src/fleet/`). */
export interface QueueSetting {
  /** redis:// URL as given (may hold a password: never printed). */
  url: string;
  /** Seconds without any block taken or finished before the fit stops; null = wait. */
  timeoutSeconds: number | null;
}

/** Raw option values from flags (strings) or a pipeline file (JSON values), camelCase keys. */
export type RawFitOptions = Record<string, unknown>;

/**
 * Turns raw `fit` options into checked FitOptions plus the worker count. `where` prefixes messages
 * (`fit` for flags, the pipeline file for pipelines); `flag` renders an option's name as the user wrote it.
 */
export function resolveFitOptions(
  raw: RawFitOptions,
  where: string,
  flag: (key: string) => string = (k) => `--${k.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`,
): { options: FitOptions; workers: number; from: string | null; queue: QueueSetting | null } {
  const fail = (key: string, requirement: string): never => {
    throw new InputError(`${where}: ${flag(key)} must be ${requirement}, got ${quote(raw[key])}`);
  };
  const { num, int } = optionReader(raw, where, flag);
  const d = DEFAULT_FIT_OPTIONS;
  const transitions = (raw.transitions ?? d.transitions) as FitTransitions;
  if (!['auto', 'fixed', 'tied', 'per-cell', 'learned'].includes(transitions)) fail('transitions', 'one of auto, fixed, tied, per-cell, learned');
  // Read (and checked) whatever the mode; recorded only by the modes that use it, so fixed and tied
  // model files stay as they were before the option existed.
  const transitionPriorStrength = num('transitionPriorStrength', d.transitionPriorStrength ?? DEFAULT_TRANSITION_PRIOR_STRENGTH, (x) => x >= 0 && x <= 1e9, 'a number from 0 to 1e9');
  const holdoutCol = raw.holdoutCol === undefined || raw.holdoutCol === null ? null : String(raw.holdoutCol);
  if (holdoutCol !== null && holdoutCol.trim() === '') fail('holdoutCol', 'a column name');
  let finalPass = d.finalPass;
  if (raw.finalPass !== undefined) {
    if (typeof raw.finalPass !== 'boolean') fail('finalPass', 'true or false');
    finalPass = raw.finalPass as boolean;
  }
  const prune = num('prune', 0, (x) => x >= 0 && x <= 0.1, 'a number from 0 to 0.1');
  const from = raw.from === undefined || raw.from === null ? null : String(raw.from);
  const options: FitOptions = {
    restarts: int('restarts', d.restarts, 1, 1000),
    holdout: num('holdout', d.holdout, (x) => x >= 0 && x < 1, 'a fraction in [0, 1)'),
    holdoutCol,
    seed: int('seed', d.seed, 0, 2 ** 31 - 1),
    transitions,
    dwell: num('dwell', d.dwell, (x) => x > 0 && x < 1, 'a probability strictly between 0 and 1'),
    hit: num('hit', d.hit, (x) => x > 0 && x <= 1, 'a probability in (0, 1]'),
    // Above 1e9 pseudo-readings per cell the objective's prior term overflows; no data set needs more.
    priorStrength: num('priorStrength', d.priorStrength, (x) => x >= 0 && x <= 1e9, 'a number from 0 to 1e9'),
    ...(transitions === 'fixed' || transitions === 'tied' ? {} : { transitionPriorStrength }),
    maxIter: int('maxIter', d.maxIter, 0, 1_000_000),
    tol: num('tol', d.tol, (x) => x >= 0, 'a number ≥ 0'),
    finalPass,
    blockSize: d.blockSize,
    fromDigest: null,
    ...(prune > 0 ? { prune } : {}),
  };
  const workers = int('workers', availableParallelism(), 1, 256);
  let queue: QueueSetting | null = null;
  if (raw.queue !== undefined && raw.queue !== null) {
    if (typeof raw.queue !== 'string' || raw.queue.trim() === '') fail('queue', 'a redis:// URL');
    const timeoutSeconds = raw.queueTimeout === undefined || raw.queueTimeout === null ? null : num('queueTimeout', 0, (x) => x > 0 && x <= 1e7, 'a number of seconds above 0');
    queue = { url: raw.queue as string, timeoutSeconds };
  } else if (raw.queueTimeout !== undefined && raw.queueTimeout !== null) {
    throw new InputError(`${where}: ${flag('queueTimeout')} must come with ${flag('queue')}, got it alone`);
  }
  return { options, workers, from, queue };
}
