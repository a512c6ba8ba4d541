/** The narrowest integer array that holds back-pointers for `nCells` cells (issue: memory flat in run length). */
export function backPointerArray(nCells: number, length: number): Uint8Array | Uint16Array | Int32Array {
  if (nCells <= 256) return new Uint8Array(length);
  if (nCells <= 65536) return new Uint16Array(length);
  return new Int32Array(length);
}
