import type { TransitionMode } from '../model/hmm-model.js';

/** What the runs carry that limits the transition modes `--transitions auto` may consider. */
export interface AutoContext {
  /**
   * True when the runs carry movement columns (`moved`/`heading`): only the movement-aware modes
   * (`fixed`, `tied`) use them, so `auto` then considers only those.
   */
  movement: boolean;
}

/** The transition modes `--transitions auto` fits and chooses among, in the order they are fitted. */
export function autoCandidates(context: AutoContext): TransitionMode[] {
  return context.movement ? ['fixed', 'tied'] : ['fixed', 'tied', 'per-cell', 'learned'];
}

/**
 * How `restarts` are shared out among `nModes` candidate modes: ⌊restarts / nModes⌋ each, the
 * remainder one more each to the first modes, and at least one each (so `--restarts 8` over four modes
 * gives 2 each, `--restarts 5` gives 2, 1, 1, 1 and `--restarts 2` gives 1 each).
 */
export function shareRestarts(restarts: number, nModes: number): number[] {
  const each = Math.floor(restarts / nModes);
  const rest = restarts % nModes;
  return Array.from({ length: nModes }, (_, c) => Math.max(1, each + (c < rest ? 1 : 0)));
}
