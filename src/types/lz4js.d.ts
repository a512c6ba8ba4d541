/** The part of lz4js (0.2.0, no bundled types) that underfoot uses: LZ4 frame (de)compression. */
declare module 'lz4js' {
  export function decompress(src: Uint8Array, maxSize?: number): ArrayLike<number>;
  export function compress(src: Uint8Array, maxSize?: number): ArrayLike<number>;
  const lz4: { decompress: typeof decompress; compress: typeof compress };
  export default lz4;
}
