/**
 * Run indices cut into consecutive blocks of `size` (the last may be shorter). E-steps are summed per
 * block and reduced in block order, so results do not depend on how many threads ran them.
 */
export function toBlocks(indices: readonly number[], size: number): number[][] {
  const blocks: number[][] = [];
  for (let a = 0; a < indices.length; a += size) blocks.push(indices.slice(a, a + size));
  return blocks;
}
