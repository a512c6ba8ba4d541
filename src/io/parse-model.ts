import { InputError, quote } from '../errors.js';
import { buildStructure } from '../model/build-structure.js';
import type { HmmModel, ModelCell } from '../model/hmm-model.js';
import { parseJsonDocument } from './parse-json-document.js';
import { checkKeys, isWellFormedText } from './json-fields.js';
import { parseFitRecord } from './parse-fit-record.js';
import { MAX_COORDINATE_METRES } from './parse-floor.js';
import { MODEL_FORMAT, type ModelFile } from './model-file.js';

/** Rows of probabilities must sum to 1 within this (they are written with full precision). */
const SUM_TOLERANCE = 1e-9;

/**
 * Reads the text of an `underfoot-model/1` file (see `formatModel`) and checks it completely: every
 * problem is one line naming the file and the cell, link or row at fault.
 */
export function parseModel(text: string, source: string): ModelFile {
  const fail = (what: string): never => {
    throw new InputError(`${source}: ${what}`);
  };
  const doc = parseJsonDocument(text, source);
  const root = asObject(doc, 'the model file', fail);
  if (root.format !== MODEL_FORMAT) fail(`"format" must be ${quote(MODEL_FORMAT)}, got ${quote(root.format)}`);
  allowKeys(root, ['format', 'name', 'surfaces', 'cells', 'links', 'emission', 'movement', 'fit'], 'the model file', fail);
  const name = typeof root.name === 'string' && isWellFormedText(root.name) ? root.name : fail(`"name" must be a string of well-formed text, got ${quote(root.name)}`);
  if (!Array.isArray(root.surfaces) || root.surfaces.length === 0 || !root.surfaces.every((s) => typeof s === 'string' && s.length > 0 && isWellFormedText(s))) {
    fail(`"surfaces" must be a non-empty list of names, got ${quote(root.surfaces)}`);
  }
  const surfaces = root.surfaces as string[];
  if (new Set(surfaces).size !== surfaces.length) fail(`"surfaces" must not repeat a name, got ${quote(surfaces)}`);
  const m = surfaces.length;

  if (!Array.isArray(root.cells) || root.cells.length === 0) fail(`"cells" must be a non-empty list, got ${quote(root.cells)}`);
  const rawCells = root.cells as unknown[];
  const n = rawCells.length;
  const index = new Map<string, number>();
  const cells: ModelCell[] = [];
  const start = new Float64Array(n);
  const dwell = new Float64Array(n);
  rawCells.forEach((raw, i) => {
    const c = asObject(raw, `cell ${i + 1}`, fail);
    allowKeys(c, ['id', 'surface', 'x', 'y', 'level', 'zone', 'start', 'dwell'], `cell ${i + 1}`, fail);
    if (typeof c.id !== 'string' || c.id.length === 0 || !isWellFormedText(c.id)) fail(`cell ${i + 1}: "id" must be a non-empty string of well-formed text, got ${quote(c.id)}`);
    const id = c.id as string;
    if (index.has(id)) fail(`cell ${quote(id)}: ids must be unique, got it twice`);
    index.set(id, i);
    if (typeof c.surface !== 'string' || !surfaces.includes(c.surface)) {
      fail(`cell ${quote(id)}: "surface" must be one of the model's surfaces, got ${quote(c.surface)}`);
    }
    for (const key of ['x', 'y'] as const) {
      const v = c[key];
      if (typeof v !== 'number' || !Number.isFinite(v) || Math.abs(v) > MAX_COORDINATE_METRES) {
        fail(`cell ${quote(id)}: "${key}" must be a finite number of metres within ±${MAX_COORDINATE_METRES}, got ${quote(v)}`);
      }
    }
    if (!Number.isSafeInteger(c.level)) fail(`cell ${quote(id)}: "level" must be an integer, got ${quote(c.level)}`);
    if (c.zone !== undefined && (typeof c.zone !== 'string' || c.zone.length === 0 || !isWellFormedText(c.zone))) {
      fail(`cell ${quote(id)}: "zone" must be a non-empty string of well-formed text, got ${quote(c.zone)}`);
    }
    start[i] = probability(c.start, `cell ${quote(id)}: "start"`, fail);
    dwell[i] = probability(c.dwell, `cell ${quote(id)}: "dwell"`, fail);
    cells.push({ id, surface: c.surface as string, x: c.x as number, y: c.y as number, level: c.level as number, ...(c.zone !== undefined ? { zone: c.zone as string } : {}) });
  });
  checkSum(start, 'the start probabilities (cells\' "start")', fail);

  if (!Array.isArray(root.links)) fail(`"links" must be a list, got ${quote(root.links)}`);
  const edges: Array<[number, number]> = [];
  const linkP: number[] = [];
  const seen = new Set<string>();
  (root.links as unknown[]).forEach((raw, l) => {
    const link = asObject(raw, `link ${l + 1}`, fail);
    allowKeys(link, ['from', 'to', 'p'], `link ${l + 1}`, fail);
    const from = typeof link.from === 'string' ? index.get(link.from) : undefined;
    const to = typeof link.to === 'string' ? index.get(link.to) : undefined;
    if (from === undefined) fail(`link ${l + 1}: "from" must name a cell, got ${quote(link.from)}`);
    if (to === undefined) fail(`link ${l + 1}: "to" must name a cell, got ${quote(link.to)}`);
    if (from === to) fail(`link ${l + 1}: a link must join two different cells, got ${quote(link.from)} to itself`);
    const key = `${from}>${to}`;
    if (seen.has(key)) fail(`link ${quote(link.from)} → ${quote(link.to)}: each link must appear once, got it twice`);
    seen.add(key);
    edges.push([from as number, to as number]);
    linkP.push(probability(link.p, `link ${quote(link.from)} → ${quote(link.to)}: "p"`, fail));
  });
  const structure = buildStructure(n, edges);
  const trans = new Float64Array(structure.nnz);
  for (let i = 0; i < n; i++) trans[structure.dwellPos[i]] = dwell[i];
  edges.forEach(([from, to], l) => {
    for (let k = structure.succPtr[from]; k < structure.succPtr[from + 1]; k++) if (structure.succIdx[k] === to) trans[k] = linkP[l];
  });
  for (let i = 0; i < n; i++) {
    checkSum(trans.subarray(structure.succPtr[i], structure.succPtr[i + 1]), `cell ${quote(cells[i].id)}: dwell plus its links' "p"`, fail);
  }

  if (!Array.isArray(root.emission) || root.emission.length !== n) {
    fail(`"emission" must have one row per cell (${n}), got ${Array.isArray(root.emission) ? `${root.emission.length} rows` : quote(root.emission)}`);
  }
  const emission = new Float64Array(n * m);
  (root.emission as unknown[]).forEach((row, i) => {
    const where = `emission row of cell ${quote(cells[i].id)}`;
    if (!Array.isArray(row) || row.length !== m) fail(`${where} must have one value per surface (${m}), got ${quote(row)}`);
    (row as unknown[]).forEach((v, r) => {
      emission[i * m + r] = probability(v, `${where}, surface ${quote(surfaces[r])}`, fail);
    });
    checkSum(emission.subarray(i * m, (i + 1) * m), where, fail);
  });

  const fit = root.fit === undefined || root.fit === null ? null : parseFitRecord(root.fit, `${source}: fit`, n, m);
  const model: HmmModel = { surfaces: surfaces.slice(), cells, structure, start, trans, emission };
  if (root.movement !== undefined) {
    const mv = asObject(root.movement, '"movement"', fail);
    allowKeys(mv, ['stayLogit', 'stayPerMetre', 'kappa'], '"movement"', fail);
    const num = (key: string, ok: (x: number) => boolean, requirement: string): number => {
      const v = mv[key];
      if (typeof v !== 'number' || !Number.isFinite(v) || !ok(v)) fail(`"movement".${key} must be ${requirement}, got ${quote(v)}`);
      return v as number;
    };
    model.movement = {
      stayLogit: num('stayLogit', () => true, 'a finite number'),
      stayPerMetre: num('stayPerMetre', () => true, 'a finite number'),
      kappa: num('kappa', (x) => x >= 0, 'a number >= 0'),
    };
  }
  return { name, model, fit };
}

function asObject(v: unknown, where: string, fail: (w: string) => never): Record<string, unknown> {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) fail(`${where} must be an object, got ${quote(v)}`);
  return v as Record<string, unknown>;
}

function allowKeys(o: Record<string, unknown>, keys: string[], where: string, fail: (w: string) => never): void {
  try {
    checkKeys(o, keys, where);
  } catch (err) {
    fail((err as Error).message);
  }
}

function probability(v: unknown, where: string, fail: (w: string) => never): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v < 0 || v > 1) fail(`${where} must be a probability in [0, 1], got ${quote(v)}`);
  return v as number;
}

function checkSum(values: ArrayLike<number>, where: string, fail: (w: string) => never): void {
  let sum = 0;
  for (let k = 0; k < values.length; k++) sum += values[k];
  if (Math.abs(sum - 1) > SUM_TOLERANCE) fail(`${where} must sum to 1, got ${sum}`);
}
