import { InputError, quote } from '../errors.js';
import type { FloorCell, FloorGraph, FloorLink, Georeference } from '../model/floor-graph.js';
import { listForMessage } from './list-for-message.js';
import { parseJsonDocument } from './parse-json-document.js';
import { checkKeys, got, isObject, isWellFormedText } from './json-fields.js';

/**
 * Parses and validates an `underfoot-floor/1` file (docs/formats.md, "Floor file"). Every problem is one
 * InputError line naming `source` and the cell or link at fault. Nothing is trimmed or guessed: unknown
 * keys, repeated keys and wrong types are errors. Cells and links keep the file's order.
 */
export function parseFloor(text: string, source: string): FloorGraph {
  const doc = parseJsonDocument(text, source);
  if (!isObject(doc)) throw new InputError(`${source}: top level must be a JSON object, got ${got(doc)}`);

  // A wrong format first (another kind of file has other keys), but a misspelt "format" key is named.
  const formatError = `${source}: "format" must be ${quote(FLOOR_FORMAT)}, got ${got(doc.format)}`;
  if (doc.format !== undefined && doc.format !== FLOOR_FORMAT) throw new InputError(formatError);
  checkKeys(doc, TOP_KEYS, `${source}: top-level`);
  if (doc.format !== FLOOR_FORMAT) throw new InputError(formatError);
  if (typeof doc.name !== 'string' || !isWellFormedText(doc.name)) throw new InputError(`${source}: "name" must be a string of well-formed text, got ${got(doc.name)}`);

  const surfaces = parseSurfaces(doc.surfaces, source);
  const cells = parseCells(doc.cells, surfaces, source);
  const cellIndex = new Map<string, number>(cells.map((cell, i) => [cell.id, i]));
  const links = parseLinks(doc.links, cellIndex, source);
  checkWaysOut(cells, links, cellIndex, source);
  const georeference = doc.georeference === undefined ? undefined : parseGeoreference(doc.georeference, source);
  return { format: FLOOR_FORMAT, name: doc.name, surfaces, cells, links, ...(georeference ? { georeference } : {}) };
}

export const FLOOR_FORMAT = 'underfoot-floor/1';
const TOP_KEYS = ['format', 'name', 'surfaces', 'cells', 'links', 'georeference'];
const CELL_KEYS = ['id', 'surface', 'x', 'y', 'level', 'start', 'zone'];
const GEOREFERENCE_KEYS = ['lat', 'lon', 'bearing'];
const LINK_KEYS = ['from', 'to', 'oneway'];

/** Cell coordinates beyond this many metres are refused: no building is that large, and squares and
 * sums of larger values overflow in the report's geometry. */
export const MAX_COORDINATE_METRES = 1e9;

function parseSurfaces(value: unknown, source: string): string[] {
  if (!Array.isArray(value) || value.length === 0) {
    throw new InputError(`${source}: "surfaces" must be a non-empty list of surface names, got ${got(value)}`);
  }
  const firstAt = new Map<string, number>();
  value.forEach((surface: unknown, i) => {
    if (typeof surface !== 'string' || surface === '') {
      throw new InputError(`${source}: surfaces[${i}] must be a non-empty string, got ${got(surface)}`);
    }
    if (!isWellFormedText(surface)) {
      throw new InputError(`${source}: surfaces[${i}] must be well-formed Unicode text, got ${got(surface)} with a lone surrogate`);
    }
    const first = firstAt.get(surface);
    if (first !== undefined) {
      throw new InputError(`${source}: surfaces[${i}] must be unique, got ${quote(surface)} again (also surfaces[${first}])`);
    }
    firstAt.set(surface, i);
  });
  return value as string[];
}

function parseCells(value: unknown, surfaces: string[], source: string): FloorCell[] {
  if (!Array.isArray(value) || value.length === 0) {
    throw new InputError(`${source}: "cells" must be a non-empty list of cells, got ${got(value)}`);
  }
  const known = new Set(surfaces);
  const firstAt = new Map<string, number>();
  return value.map((raw: unknown, i): FloorCell => {
    if (!isObject(raw)) throw new InputError(`${source}: cells[${i}] must be an object, got ${got(raw)}`);
    const hasId = typeof raw.id === 'string' && raw.id !== '';
    const where = hasId ? `${source}: cell ${quote(raw.id)} (cells[${i}])` : `${source}: cells[${i}]`;
    checkKeys(raw, CELL_KEYS, where);
    if (!hasId) throw new InputError(`${where} "id" must be a non-empty string, got ${got(raw.id)}`);
    const id = raw.id as string;
    if (!isWellFormedText(id)) {
      throw new InputError(`${where} "id" must be well-formed Unicode text, got ${got(id)} with a lone surrogate`);
    }
    const first = firstAt.get(id);
    if (first !== undefined) {
      throw new InputError(`${where} "id" must be unique, got ${quote(id)} again (also cells[${first}])`);
    }
    firstAt.set(id, i);
    if (typeof raw.surface !== 'string') {
      throw new InputError(`${where} "surface" must be a string, got ${got(raw.surface)}`);
    }
    if (!known.has(raw.surface)) {
      throw new InputError(
        `${where} "surface" must be one of the surfaces (${listForMessage(surfaces)}), got ${quote(raw.surface)}`,
      );
    }
    for (const key of ['x', 'y'] as const) {
      const v = raw[key];
      if (typeof v !== 'number' || !Number.isFinite(v) || Math.abs(v) > MAX_COORDINATE_METRES) {
        throw new InputError(`${where} "${key}" must be a finite number of metres within ±${MAX_COORDINATE_METRES}, got ${got(v)}`);
      }
    }
    const level = raw.level === undefined ? 0 : raw.level;
    if (typeof level !== 'number' || !Number.isSafeInteger(level)) {
      throw new InputError(`${where} "level" must be an integer, got ${got(raw.level)}`);
    }
    const start = raw.start === undefined ? false : raw.start;
    if (typeof start !== 'boolean') throw new InputError(`${where} "start" must be true or false, got ${got(raw.start)}`);
    if (raw.zone !== undefined && (typeof raw.zone !== 'string' || raw.zone === '' || !isWellFormedText(raw.zone))) {
      throw new InputError(`${where} "zone" must be a non-empty string of well-formed text, got ${got(raw.zone)}`);
    }
    const cell: FloorCell = { id, surface: raw.surface, x: raw.x as number, y: raw.y as number, level, start };
    if (raw.zone !== undefined) cell.zone = raw.zone as string;
    return cell;
  });
}

/** `"georeference": {"lat", "lon", "bearing"}`: WGS 84 degrees of the x/y origin, x axis bearing clockwise from north. */
function parseGeoreference(value: unknown, source: string): Georeference {
  const where = `${source}: "georeference"`;
  if (!isObject(value)) throw new InputError(`${where} must be an object with "lat", "lon" and "bearing", got ${got(value)}`);
  checkKeys(value, GEOREFERENCE_KEYS, where);
  const ranges: Array<[keyof Georeference, string, (v: number) => boolean]> = [
    ['lat', 'a number of degrees in [-90, 90]', (v) => v >= -90 && v <= 90],
    ['lon', 'a number of degrees in [-180, 180]', (v) => v >= -180 && v <= 180],
    ['bearing', 'a number of degrees in [0, 360) (the x axis, clockwise from north)', (v) => v >= 0 && v < 360],
  ];
  for (const [key, requirement, inRange] of ranges) {
    const v = value[key];
    if (typeof v !== 'number' || !Number.isFinite(v) || !inRange(v)) throw new InputError(`${where} "${key}" must be ${requirement}, got ${got(v)}`);
  }
  return { lat: value.lat as number, lon: value.lon as number, bearing: value.bearing as number };
}

function linkName(link: { from: string; to: string; oneway: boolean }): string {
  return `${quote(link.from)} ${link.oneway ? '->' : '<->'} ${quote(link.to)}`;
}

function parseLinks(value: unknown, cellIndex: Map<string, number>, source: string): FloorLink[] {
  if (!Array.isArray(value)) throw new InputError(`${source}: "links" must be a list of links, got ${got(value)}`);
  // Directed edge "fromIndex,toIndex" -> index of the link that declared it.
  const edgeOwner = new Map<string, number>();
  const links: FloorLink[] = [];
  value.forEach((raw: unknown, i) => {
    if (!isObject(raw)) throw new InputError(`${source}: links[${i}] must be an object, got ${got(raw)}`);
    checkKeys(raw, LINK_KEYS, `${source}: links[${i}]`);
    for (const key of ['from', 'to'] as const) {
      if (typeof raw[key] !== 'string') {
        throw new InputError(`${source}: links[${i}] "${key}" must be a cell id, got ${got(raw[key])}`);
      }
    }
    const oneway = raw.oneway === undefined ? false : raw.oneway;
    const link = { from: raw.from as string, to: raw.to as string, oneway: oneway as boolean };
    const where = `${source}: link ${linkName(link)} (links[${i}])`;
    if (typeof oneway !== 'boolean') throw new InputError(`${where} "oneway" must be true or false, got ${got(raw.oneway)}`);
    const from = cellIndex.get(link.from);
    const to = cellIndex.get(link.to);
    if (from === undefined) throw new InputError(`${where} "from" must be the id of a cell, got ${quote(link.from)}`);
    if (to === undefined) throw new InputError(`${where} "to" must be the id of a cell, got ${quote(link.to)}`);
    if (from === to) throw new InputError(`${where} must join two different cells, got a link from ${quote(link.from)} to itself`);
    const edges = link.oneway ? [`${from},${to}`] : [`${from},${to}`, `${to},${from}`];
    for (const edge of edges) {
      const owner = edgeOwner.get(edge);
      if (owner !== undefined) {
        throw new InputError(`${where} must be declared once, got the same move as links[${owner}] ${linkName(links[owner])}`);
      }
    }
    for (const edge of edges) edgeOwner.set(edge, i);
    links.push(link);
  });
  return links;
}

/** Every cell needs a link leaving it (the implicit dwell does not count): a run could never leave it. */
function checkWaysOut(cells: FloorCell[], links: FloorLink[], cellIndex: Map<string, number>, source: string): void {
  const nOut = new Int32Array(cells.length);
  const nIn = new Int32Array(cells.length);
  for (const link of links) {
    const from = cellIndex.get(link.from) as number;
    const to = cellIndex.get(link.to) as number;
    nOut[from]++;
    nIn[to]++;
    if (!link.oneway) {
      nOut[to]++;
      nIn[from]++;
    }
  }
  cells.forEach((cell, i) => {
    if (nOut[i] === 0) {
      const actual = nIn[i] > 0 ? `only one-way links into it (${nIn[i]})` : 'no links';
      throw new InputError(`${source}: cell ${quote(cell.id)} (cells[${i}]) must have a way out (a link leaving it), got ${actual}`);
    }
  });
}
