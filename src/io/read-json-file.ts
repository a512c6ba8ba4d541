import { decodeUtf8 } from './decode-utf8.js';
import { MAX_JSON_BYTES, readInputFile } from './read-input-file.js';

/**
 * The one way every JSON input (floor, model, pipeline, checkpoint) is read from disk: at most
 * `MAX_JSON_BYTES` bytes (read in chunks, so an endless stream is refused at the cap) → strict UTF-8 (a
 * bad byte is an error, never U+FFFD). The text then goes to the format's parser, which starts with
 * `parseJsonDocument` (syntax, repeated keys, nesting depth) and checks fields with `json-fields.ts`.
 */
export async function readJsonText(path: string): Promise<string> {
  return decodeUtf8(await readInputFile(path, MAX_JSON_BYTES), path);
}
