import type { ExpectedCountsTable } from './expected-counts-table.js';

/** Adds `b` into `a` (in place), in a fixed order so that sums are reproducible. Returns `a`. */
export function addCounts(a: ExpectedCountsTable, b: ExpectedCountsTable): ExpectedCountsTable {
  for (let i = 0; i < a.start.length; i++) a.start[i] += b.start[i];
  for (let k = 0; k < a.trans.length; k++) a.trans[k] += b.trans[k];
  for (let x = 0; x < a.emitT.length; x++) a.emitT[x] += b.emitT[x];
  a.logLik += b.logLik;
  a.nReadings += b.nReadings;
  a.nRuns += b.nRuns;
  if (b.move) {
    if (!a.move) throw new RangeError('addCounts: movement counts must be added into a table that has them');
    const x = a.move;
    const y = b.move;
    for (let k = 0; k < x.stayByDistance.length; k++) x.stayByDistance[k] += y.stayByDistance[k];
    for (let k = 0; k < x.moveByDistance.length; k++) x.moveByDistance[k] += y.moveByDistance[k];
    for (let k = 0; k < x.moveByHeading.length; k++) x.moveByHeading[k] += y.moveByHeading[k];
    for (let k = 0; k < x.headingCos.length; k++) {
      x.headingCos[k] += y.headingCos[k];
      x.headingSin[k] += y.headingSin[k];
    }
  }
  return a;
}
