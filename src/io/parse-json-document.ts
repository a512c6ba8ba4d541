import { InputError, quote } from '../errors.js';
import { locateJsonError } from './locate-json-error.js';

/**
 * Parses the text of one of our JSON files (floor, model, pipeline, checkpoint; a leading byte-order
 * mark is accepted). The whole text is scanned first (`locateJsonError`), so a syntax error, a key given
 * twice in one object (JSON.parse would silently keep the last) or nesting deeper than
 * `MAX_JSON_DEPTH` is one line naming the file, the line and the column.
 */
export function parseJsonDocument(text: string, source: string): unknown {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const problem = locateJsonError(body);
  if (problem) {
    const at = `line ${problem.line}, column ${problem.column}`;
    if (problem.kind === 'repeated-key') {
      throw new InputError(`${source}: each object must name a key once, got ${problem.what} at ${at}`);
    }
    throw new InputError(`${source}: file must be valid JSON, got ${problem.what} at ${at}`);
  }
  try {
    return JSON.parse(body) as unknown;
  } catch (err) {
    // Only reached if the scanner and JSON.parse ever disagree.
    throw new InputError(`${source}: file must be valid JSON, got ${quote((err as Error).message)}`);
  }
}
