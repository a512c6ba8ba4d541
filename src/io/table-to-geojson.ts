import { WorkError, quote } from '../errors.js';
import { checkOutputTable } from './check-output-table.js';
import type { OutputTable } from './output-table.js';

export interface GeoJsonOptions {
  /** The columns holding each row's position in floor-frame metres (the annotated table: `path_x`, `path_y`). */
  xColumn: string;
  yColumn: string;
  /**
   * Floor metres → `[lon, lat]` in WGS 84 (`floorToWgs84` with the floor's georeference); null when the
   * floor has none: coordinates are then written in floor-frame metres, as `underfoot.coordinates` says.
   */
  toLonLat: ((x: number, y: number) => [number, number]) | null;
  /** More members of the collection's foreign member `underfoot` (tool version, caution, …), as JSON values. */
  about?: Record<string, unknown>;
}

/** Decimal places of written coordinates: 1e-8 degree is about 1 mm (RFC 7946 section 11.2 asks for no more than needed). */
const DEGREE_DECIMALS = 8;
const METRE_DECIMALS = 4;

/**
 * The table as a GeoJSON FeatureCollection (RFC 7946), in pieces of `rowsPerChunk` features for
 * streaming: one Point feature per row at (`xColumn`, `yColumn`) — null geometry where those are null —
 * with every column as a property (numbers, text, booleans, null; non-finite numbers as null, 64-bit
 * integers as numbers). The collection carries a foreign member `underfoot` saying which coordinates it
 * holds: `"coordinates": "WGS 84 longitude, latitude (degrees)"` or, without a georeference,
 * `"floor-frame metres x, y (not WGS 84)"`.
 */
export function* geoJsonChunks(table: OutputTable, options: GeoJsonOptions, rowsPerChunk = 4096, where = 'output table'): Generator<string> {
  checkOutputTable(table, where);
  const xCol = table.columns.find((c) => c.name === options.xColumn);
  const yCol = table.columns.find((c) => c.name === options.yColumn);
  if (!xCol || !yCol) {
    throw new WorkError(`${where}: GeoJSON position columns must be in the table, got no ${quote(!xCol ? options.xColumn : options.yColumn)}`);
  }
  const about: Record<string, unknown> = {
    coordinates: options.toLonLat ? 'WGS 84 longitude, latitude (degrees)' : 'floor-frame metres x, y (not WGS 84: the floor has no georeference)',
    position: `${options.xColumn}, ${options.yColumn}`,
    ...options.about,
  };
  yield `{"type":"FeatureCollection","underfoot":${JSON.stringify(about)},"features":[`;
  const keys = table.columns.map((c) => JSON.stringify(c.name));
  const decimals = options.toLonLat ? DEGREE_DECIMALS : METRE_DECIMALS;
  for (let first = 0; first < table.nRows; first += rowsPerChunk) {
    const last = Math.min(table.nRows, first + rowsPerChunk);
    const features = new Array<string>(last - first);
    for (let row = first; row < last; row++) {
      const x = xCol.get(row);
      const y = yCol.get(row);
      let geometry = 'null';
      if (typeof x === 'number' && typeof y === 'number' && Number.isFinite(x) && Number.isFinite(y)) {
        const [a, b] = options.toLonLat ? options.toLonLat(x, y) : [x, y];
        geometry = `{"type":"Point","coordinates":[${fixed(a, decimals)},${fixed(b, decimals)}]}`;
      }
      const props = table.columns.map((c, j) => `${keys[j]}:${jsonValue(c.get(row))}`).join(',');
      features[row - first] = `${row === 0 ? '' : ','}{"type":"Feature","geometry":${geometry},"properties":{${props}}}`;
    }
    yield features.join('');
  }
  yield ']}\n';
}

/** Shortest text of `v` rounded to `decimals` places (no trailing zeros, no exponent for the ranges used). */
function fixed(v: number, decimals: number): string {
  return String(Number(v.toFixed(decimals)));
}

function jsonValue(v: string | number | bigint | boolean | null): string {
  if (v === null || v === undefined) return 'null';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : 'null';
  if (typeof v === 'bigint') return v.toString();
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  return JSON.stringify(v);
}
