/**
 * Works through blocks shared between threads: takes the next block index from `next[0]` (a counter in
 * a SharedArrayBuffer, `Atomics.add`), computes it, and repeats until every index below `nBlocks` is
 * taken. Returns the blocks this thread computed, as [index, result] pairs. Every thread that calls it
 * on the same counter gets a disjoint share; which thread takes which block depends on timing, but each
 * block's result does not, so results placed by index are the same for any number of threads.
 */
export function takeBlocks<R>(next: Int32Array, nBlocks: number, compute: (block: number) => R): Array<[number, R]> {
  const done: Array<[number, R]> = [];
  for (let b = Atomics.add(next, 0, 1); b < nBlocks; b = Atomics.add(next, 0, 1)) done.push([b, compute(b)]);
  return done;
}
