import { isUtf8 } from 'node:buffer';
import { InputError } from '../errors.js';

/** Fails unless `bytes` are strict UTF-8 (no invalid, overlong or surrogate sequences). */
export function checkUtf8(bytes: Uint8Array, source: string): void {
  if (isUtf8(bytes)) return;
  // Only on the error path: find the first line holding the bad bytes (a newline byte is never part of
  // a multi-byte UTF-8 sequence, so each line can be checked on its own).
  let line = 1;
  let start = 0;
  while (start <= bytes.length) {
    let end = bytes.indexOf(0x0a, start);
    if (end < 0) end = bytes.length;
    if (!isUtf8(bytes.subarray(start, end))) break;
    start = end + 1;
    line++;
  }
  throw new InputError(`${source}: file must be UTF-8 text, got bytes that are not valid UTF-8 on line ${line}`);
}

/**
 * Decodes UTF-8 bytes to text, keeping a leading byte-order mark for the parser to drop. Invalid bytes
 * are an error rather than silently becoming U+FFFD; a text longer than a JavaScript string can hold is
 * an error that suggests Arrow instead.
 */
export function decodeUtf8(bytes: Uint8Array, source: string): string {
  try {
    return new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(bytes);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ERR_ENCODING_INVALID_ENCODED_DATA') {
      throw new InputError(`${source}: file must be UTF-8 text, got bytes that are not valid UTF-8`);
    }
    if (code === 'ERR_STRING_TOO_LONG' || err instanceof RangeError) {
      throw new InputError(
        `${source}: text file must fit in one string (about 512 MB), got ${bytes.length} bytes; convert it to Arrow`,
      );
    }
    throw err;
  }
}
