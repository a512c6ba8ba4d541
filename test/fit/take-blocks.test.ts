import { describe, it, expect } from 'vitest';
import { takeBlocks } from '../../src/fit/take-blocks.js';

describe('takeBlocks(next, nBlocks, compute)', () => {
  it('takes every block once, in counter order, and leaves the counter past the end', () => {
    const next = new Int32Array(new SharedArrayBuffer(4));
    const done = takeBlocks(next, 5, (b) => b * 10);
    expect(done).toEqual([[0, 0], [1, 10], [2, 20], [3, 30], [4, 40]]);
    expect(next[0]).toBeGreaterThanOrEqual(5);
    expect(takeBlocks(next, 5, () => 1)).toEqual([]);
  });

  it('a second taker on the same counter (here, started while the first computes block 0) gets the rest, with no block twice', () => {
    const next = new Int32Array(new SharedArrayBuffer(4));
    let second: Array<[number, number]> = [];
    const first = takeBlocks(next, 8, (b) => {
      if (b === 0) second = takeBlocks(next, 8, (x) => -x);
      return b;
    });
    expect(first).toEqual([[0, 0]]);
    expect(second.map(([b]) => b)).toEqual([1, 2, 3, 4, 5, 6, 7]);
  });
});
