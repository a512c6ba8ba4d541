import type { FloorGraph } from '../model/floor-graph.js';
import { parseFloor } from './parse-floor.js';
import { readJsonText } from './read-json-file.js';

/** Reads and validates a floor file (see `parseFloor`); every failure is a one-line InputError. */
export async function readFloor(path: string): Promise<FloorGraph> {
  return parseFloor(await readJsonText(path), path);
}
