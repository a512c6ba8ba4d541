import { InputError } from '../errors.js';
import { locateJsonError } from './locate-json-error.js';

/**
 * Parses the text of one of our JSON files (a byte-order mark is accepted), turning a syntax error into
 * one line naming the file and the line and column: `<source>: the <what> must be valid JSON, got …`.
 */
export function parseJsonDocument(text: string, source: string, what: string): unknown {
  try {
    return JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch {
    const where = locateJsonError(text);
    throw new InputError(
      `${source}: the ${what} must be valid JSON, got ${where ? `${where.what} at line ${where.line}, column ${where.column}` : 'invalid JSON'}`,
    );
  }
}
