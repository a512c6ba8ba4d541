import type { FloorGraph } from '../model/floor-graph.js';
import { decodeUtf8 } from './decode-utf8.js';
import { parseFloor } from './parse-floor.js';
import { readInputFile } from './read-input-file.js';

/** Reads and validates a floor file (see `parseFloor`); every failure is a one-line InputError. */
export async function readFloor(path: string): Promise<FloorGraph> {
  const bytes = await readInputFile(path);
  return parseFloor(decodeUtf8(bytes, path), path);
}
