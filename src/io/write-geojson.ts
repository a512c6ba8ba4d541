import { extname } from 'node:path';
import type { OutputTable } from './output-table.js';
import { geoJsonChunks, type GeoJsonOptions } from './table-to-geojson.js';
import { writeFileAtomic } from './write-atomic.js';

/** Whether an output path names a GeoJSON file (`.geojson`, any letter case). */
export function isGeoJsonPath(path: string): boolean {
  return extname(path).toLowerCase() === '.geojson';
}

/** Writes `table` as a GeoJSON FeatureCollection (see `geoJsonChunks`) atomically, streamed in pieces. */
export async function writeGeoJson(path: string, table: OutputTable, options: GeoJsonOptions): Promise<void> {
  const chunks = geoJsonChunks(table, options, 4096, path);
  // Draw the first piece so a bad table fails before a temporary file is made.
  const first = chunks.next();
  await writeFileAtomic(path, (function* () {
    if (!first.done) yield first.value;
    yield* chunks;
  })());
}
