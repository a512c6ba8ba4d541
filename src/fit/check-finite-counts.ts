import type { HmmModel } from '../model/hmm-model.js';
import type { ExpectedCountsTable } from '../model/expected-counts-table.js';
import { WorkError } from '../errors.js';

/** Stops a fit when an E-step produced a non-finite number, naming the cell where it appeared. */
export function checkFiniteCounts(model: HmmModel, counts: ExpectedCountsTable): void {
  const n = model.cells.length;
  if (!Number.isFinite(counts.logLik)) throw new WorkError(`E-step: the log-likelihood must be finite, got ${counts.logLik}`);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(counts.start[i])) throw new WorkError(`E-step: cell ${JSON.stringify(model.cells[i].id)} start count must be finite, got ${counts.start[i]}`);
  }
  for (let x = 0; x < counts.emitT.length; x++) {
    if (!Number.isFinite(counts.emitT[x])) {
      throw new WorkError(`E-step: cell ${JSON.stringify(model.cells[x % n].id)} reading counts must be finite, got ${counts.emitT[x]}`);
    }
  }
  const s = model.structure;
  for (let i = 0; i < n; i++) {
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
      if (!Number.isFinite(counts.trans[k])) throw new WorkError(`E-step: cell ${JSON.stringify(model.cells[i].id)} transition counts must be finite, got ${counts.trans[k]}`);
    }
  }
}
