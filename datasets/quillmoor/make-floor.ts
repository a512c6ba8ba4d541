/**
 * Generates the demo building "Quillmoor Arts Centre" — an invented two-level arts centre, not a real
 * place — as `floor.json` (`underfoot-floor/1`, see docs/formats.md, "Floor file") and the invented sensor
 * confusion table `sensor-confusion.json`, both next to this script.
 *
 *     npx tsx datasets/quillmoor/make-floor.ts
 *
 * Deterministic: no randomness, so running it again writes the same bytes. Every room is a rectangle of
 * 1 m × 1 m cells on its level's grid; cells in the same room are joined to their four neighbours;
 * rooms are joined only at the doorways listed below; the two lift cells are joined to each other; the
 * stairway landings are not (robots cannot climb stairs). Before writing, the script checks the contract's
 * validity rules and reachability and stops with an error if any fails; then it parses the written text
 * back with the tool's own reader (`parseFloor`). Every cell carries its room's name as its `zone`,
 * except the two lift cars, which share the zone "Lift" across both levels (the shaft links them).
 *
 * This is a development script outside `src/`, so it writes its two output files itself.
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseFloor } from '../../src/io/parse-floor.js';
import type { FloorCell, FloorGraph, FloorLink } from '../../src/model/floor-graph.js';

/** The reading alphabet, in file order. */
const SURFACES = ['oak', 'laminate', 'carpet', 'tile', 'rubber', 'concrete'] as const;
type Surface = (typeof SURFACES)[number];

/** A rectangular room of `w × h` cells with its lower-left cell at grid column `x0`, row `y0`. */
interface Room {
  level: number;
  code: string;
  name: string;
  x0: number;
  y0: number;
  w: number;
  h: number;
  /** Surface of the cell at grid column `col`, row `row` (level coordinates). */
  surface: (col: number, row: number) => Surface;
  /** The cells' zone; the room's name when not given. */
  zone?: string;
  /** Grid positions `[col, row]` of cells where runs may begin (the robots' docks). */
  docks?: Array<[number, number]>;
}

/** A link between the cells at two grid positions (`[level, col, row]`). */
interface Door {
  a: [number, number, number];
  b: [number, number, number];
  /** One-way doors allow only a → b. */
  oneway?: boolean;
  what: string;
}

const all = (s: Surface) => (): Surface => s;

// Grid: columns run west → east (x), rows south → north (y); the street is to the south.
const ROOMS: Room[] = [
  // ---- Level 0 (ground floor) ----
  { level: 0, code: 'GAL', name: 'Gallery', x0: 0, y0: 2, w: 6, h: 4, surface: all('oak') },
  { level: 0, code: 'ENT', name: 'Entrance vestibule', x0: 8, y0: 0, w: 2, h: 2, surface: all('rubber') },
  {
    level: 0, code: 'FOY', name: 'Foyer', x0: 6, y0: 2, w: 6, h: 4,
    // Polished concrete, with the entrance mats continuing a metre into the foyer.
    surface: (col, row) => (row === 2 && (col === 8 || col === 9) ? 'rubber' : 'concrete'),
  },
  { level: 0, code: 'CAF', name: 'Café', x0: 12, y0: 2, w: 5, h: 4, surface: all('tile') },
  { level: 0, code: 'WCG', name: 'Washrooms (ground)', x0: 17, y0: 3, w: 3, h: 3, surface: all('tile') },
  {
    level: 0, code: 'COR', name: 'Ground corridor', x0: 0, y0: 6, w: 20, h: 1,
    // Oak past the gallery, the foyer's concrete in the middle, laminate towards the café end.
    surface: (col) => (col < 6 ? 'oak' : col < 12 ? 'concrete' : 'laminate'),
  },
  {
    level: 0, code: 'STO', name: 'Store and robot docks', x0: 0, y0: 7, w: 4, h: 3, surface: all('concrete'),
    docks: [[0, 9], [1, 9], [2, 9], [3, 9]],
  },
  { level: 0, code: 'WKS', name: 'Workshop', x0: 4, y0: 7, w: 5, h: 3, surface: all('concrete') },
  { level: 0, code: 'LFT', name: 'Lift car (ground stop)', zone: 'Lift', x0: 9, y0: 7, w: 1, h: 1, surface: all('rubber') },
  { level: 0, code: 'STR', name: 'Stair landing (ground)', x0: 10, y0: 7, w: 2, h: 1, surface: all('concrete') },
  { level: 0, code: 'BOX', name: 'Box office', x0: 12, y0: 7, w: 3, h: 3, surface: all('carpet') },

  // ---- Level 1 (first floor) ----
  { level: 1, code: 'ST1', name: 'Studio 1', x0: 0, y0: 3, w: 5, h: 3, surface: all('laminate') },
  { level: 1, code: 'ST2', name: 'Studio 2 (raised floor)', x0: 5, y0: 3, w: 5, h: 3, surface: all('laminate') },
  { level: 1, code: 'MTG', name: 'Meeting room', x0: 12, y0: 3, w: 4, h: 3, surface: all('carpet') },
  { level: 1, code: 'WCF', name: 'Washrooms (first)', x0: 17, y0: 3, w: 3, h: 3, surface: all('tile') },
  {
    level: 1, code: 'COR', name: 'First-floor corridor', x0: 0, y0: 6, w: 20, h: 1,
    // Laminate by the studios, carpet along the office end.
    surface: (col) => (col < 10 ? 'laminate' : 'carpet'),
  },
  { level: 1, code: 'REH', name: 'Rehearsal room', x0: 0, y0: 7, w: 6, h: 2, surface: all('rubber') },
  { level: 1, code: 'LFT', name: 'Lift car (first stop)', zone: 'Lift', x0: 9, y0: 7, w: 1, h: 1, surface: all('rubber') },
  { level: 1, code: 'STR', name: 'Stair landing (first)', x0: 10, y0: 7, w: 2, h: 1, surface: all('concrete') },
  { level: 1, code: 'OFA', name: 'Offices A', x0: 12, y0: 7, w: 4, h: 3, surface: all('carpet') },
  { level: 1, code: 'OFB', name: 'Offices B', x0: 16, y0: 7, w: 4, h: 3, surface: all('carpet') },
];

const DOORS: Door[] = [
  // Level 0
  { a: [0, 8, 1], b: [0, 8, 2], what: 'vestibule to foyer (west leaf)' },
  { a: [0, 9, 1], b: [0, 9, 2], what: 'vestibule to foyer (east leaf)' },
  ...[6, 7, 8, 9, 10, 11].map((col): Door => ({ a: [0, col, 5], b: [0, col, 6], what: 'foyer opens onto the corridor' })),
  { a: [0, 3, 5], b: [0, 3, 6], what: 'gallery entrance from the corridor' },
  { a: [0, 5, 3], b: [0, 6, 3], oneway: true, what: 'gallery exit turnstile into the foyer (one-way)' },
  { a: [0, 11, 3], b: [0, 12, 3], oneway: true, what: 'café entry gate from the foyer (one-way)' },
  { a: [0, 14, 5], b: [0, 14, 6], what: 'café door to the corridor' },
  { a: [0, 18, 5], b: [0, 18, 6], what: 'washroom door (ground)' },
  { a: [0, 2, 7], b: [0, 2, 6], what: 'store door to the corridor' },
  { a: [0, 3, 8], b: [0, 4, 8], what: 'store to workshop' },
  { a: [0, 6, 7], b: [0, 6, 6], what: 'workshop double doors' },
  { a: [0, 9, 7], b: [0, 9, 6], what: 'lift door (ground)' },
  { a: [0, 10, 7], b: [0, 10, 6], what: 'stair landing (ground)' },
  { a: [0, 13, 7], b: [0, 13, 6], what: 'box office door' },
  // Between levels: the lift only. The stair landings have no link between them.
  { a: [0, 9, 7], b: [1, 9, 7], what: 'lift shaft' },
  // Level 1
  { a: [1, 9, 7], b: [1, 9, 6], what: 'lift door (first)' },
  { a: [1, 10, 7], b: [1, 10, 6], what: 'stair landing (first)' },
  { a: [1, 2, 5], b: [1, 2, 6], what: 'studio 1 door' },
  { a: [1, 4, 4], b: [1, 5, 4], what: 'sliding partition between the studios' },
  { a: [1, 6, 5], b: [1, 6, 6], what: 'studio 2 west door' },
  { a: [1, 9, 5], b: [1, 9, 6], oneway: true, what: 'studio 2 east ramp, descended only (one-way)' },
  { a: [1, 14, 5], b: [1, 14, 6], what: 'meeting room door' },
  { a: [1, 18, 5], b: [1, 18, 6], what: 'washroom door (first)' },
  { a: [1, 3, 7], b: [1, 3, 6], what: 'rehearsal room door' },
  { a: [1, 13, 7], b: [1, 13, 6], what: 'offices A door' },
  { a: [1, 17, 7], b: [1, 17, 6], what: 'offices B door' },
  { a: [1, 15, 8], b: [1, 16, 8], what: 'door between offices A and B' },
];

/**
 * P(reading | true surface), invented for the demo (not measured): look-alike pairs oak/laminate and
 * tile/concrete confuse most, carpet/rubber somewhat. Rows in SURFACES order.
 */
const CONFUSION: Record<Surface, Record<Surface, number>> = {
  oak: { oak: 0.78, laminate: 0.15, carpet: 0.02, tile: 0.01, rubber: 0.01, concrete: 0.03 },
  laminate: { oak: 0.16, laminate: 0.74, carpet: 0.02, tile: 0.04, rubber: 0.01, concrete: 0.03 },
  carpet: { oak: 0.02, laminate: 0.02, carpet: 0.84, tile: 0.01, rubber: 0.09, concrete: 0.02 },
  tile: { oak: 0.02, laminate: 0.04, carpet: 0.01, tile: 0.76, rubber: 0.02, concrete: 0.15 },
  rubber: { oak: 0.01, laminate: 0.02, carpet: 0.1, tile: 0.03, rubber: 0.8, concrete: 0.04 },
  concrete: { oak: 0.02, laminate: 0.03, carpet: 0.02, tile: 0.14, rubber: 0.04, concrete: 0.75 },
};

const pad = (k: number): string => String(k).padStart(2, '0');
const key = (level: number, col: number, row: number): string => `${level}:${col}:${row}`;

function fail(message: string): never {
  throw new Error(`make-floor: ${message}`);
}

/** Builds the floor graph from ROOMS and DOORS; throws on overlapping rooms or doors that do not fit. */
export function buildQuillmoor(): FloorGraph {
  const cells: FloorCell[] = [];
  const links: FloorLink[] = [];
  const idAt = new Map<string, string>();
  const roomAt = new Map<string, Room>();
  for (const room of ROOMS) {
    const docks = new Set((room.docks ?? []).map(([c, r]) => key(room.level, c, r)));
    for (let row = room.y0; row < room.y0 + room.h; row++) {
      for (let col = room.x0; col < room.x0 + room.w; col++) {
        const k = key(room.level, col, row);
        const other = roomAt.get(k);
        if (other) fail(`grid position ${k} must belong to one room, got ${other.code} and ${room.code}`);
        const id = `L${room.level}-${room.code}-${pad(col - room.x0)}-${pad(row - room.y0)}`;
        idAt.set(k, id);
        roomAt.set(k, room);
        const cell: FloorCell = { id, surface: room.surface(col, row), x: col + 0.5, y: row + 0.5, level: room.level, start: docks.has(k), zone: room.zone ?? room.name };
        cells.push(cell);
        docks.delete(k);
        // Within a room: join to the west and south neighbours (each pair once, two-way).
        if (col > room.x0) links.push({ from: idAt.get(key(room.level, col - 1, row)) as string, to: id, oneway: false });
        if (row > room.y0) links.push({ from: idAt.get(key(room.level, col, row - 1)) as string, to: id, oneway: false });
      }
    }
    if (docks.size > 0) fail(`room ${room.code}: docks must lie inside the room, got ${[...docks].join(', ')}`);
  }
  for (const door of DOORS) {
    const from = idAt.get(key(...door.a));
    const to = idAt.get(key(...door.b));
    if (!from || !to) fail(`door "${door.what}" must join two cells, got ${door.a.join(':')} → ${door.b.join(':')}`);
    const sameLevel = door.a[0] === door.b[0];
    const gap = Math.abs(door.a[1] - door.b[1]) + Math.abs(door.a[2] - door.b[2]);
    const isLift = roomAt.get(key(...door.a))?.code === 'LFT' && roomAt.get(key(...door.b))?.code === 'LFT';
    if (!(sameLevel ? gap === 1 : isLift && gap === 0)) {
      fail(`door "${door.what}" must join neighbouring cells (or the lift cells of two levels), got ${from} → ${to}`);
    }
    links.push({ from, to, oneway: door.oneway === true });
  }
  return { format: 'underfoot-floor/1', name: 'Quillmoor Arts Centre (invented demo building)', surfaces: [...SURFACES], cells, links };
}

/** The contract's validity rules plus reachability both ways between the docks and every cell. */
export function checkQuillmoor(floor: FloorGraph): void {
  const index = new Map<string, number>();
  floor.cells.forEach((c, i) => {
    if (index.has(c.id)) fail(`cell id ${c.id} must be unique`);
    index.set(c.id, i);
    if (!floor.surfaces.includes(c.surface)) fail(`cell ${c.id}: surface must be declared, got ${c.surface}`);
  });
  const n = floor.cells.length;
  const out: number[][] = Array.from({ length: n }, () => []);
  const into: number[][] = Array.from({ length: n }, () => []);
  const moves = new Set<string>();
  for (const link of floor.links) {
    const a = index.get(link.from);
    const b = index.get(link.to);
    if (a === undefined || b === undefined) fail(`link ${link.from} → ${link.to} must join known cells`);
    if (a === b) fail(`link ${link.from} → ${link.to} must not join a cell to itself`);
    const pairs: Array<[number, number]> = link.oneway ? [[a, b]] : [[a, b], [b, a]];
    for (const [p, q] of pairs) {
      const move = `${p},${q}`;
      if (moves.has(move)) fail(`link ${link.from} → ${link.to} must be declared once`);
      moves.add(move);
      out[p].push(q);
      into[q].push(p);
    }
  }
  floor.cells.forEach((c, i) => {
    if (out[i].length === 0) fail(`cell ${c.id} must have a way out`);
  });
  const starts = floor.cells.flatMap((c, i) => (c.start ? [i] : []));
  if (starts.length === 0) fail('at least one cell must be a start (dock) cell');
  const search = (adjacency: number[][]): boolean[] => {
    const seen = new Array<boolean>(n).fill(false);
    const queue = [...starts];
    for (const s of starts) seen[s] = true;
    while (queue.length > 0) {
      const i = queue.shift() as number;
      for (const j of adjacency[i]) if (!seen[j]) queue.push(j), (seen[j] = true);
    }
    return seen;
  };
  const reached = search(out);
  const returns = search(into);
  floor.cells.forEach((c, i) => {
    if (!reached[i]) fail(`cell ${c.id} must be reachable from a dock along links`);
    if (!returns[i]) fail(`cell ${c.id} must have a way back to a dock along links`);
  });
}

function checkConfusion(): void {
  for (const s of SURFACES) {
    const row = CONFUSION[s];
    let sum = 0;
    for (const r of SURFACES) {
      const p = row[r];
      if (!(p > 0 && p < 1)) fail(`confusion row ${s}: P(${r}) must be in (0, 1), got ${p}`);
      sum += p;
    }
    if (Math.abs(sum - 1) > 1e-12) fail(`confusion row ${s} must sum to 1, got ${sum}`);
  }
}

/** One cell or link per line, so diffs of the file stay readable. */
function floorText(floor: FloorGraph): string {
  const cell = (c: FloorCell): string =>
    JSON.stringify({ id: c.id, surface: c.surface, x: c.x, y: c.y, level: c.level, ...(c.start ? { start: true } : {}), ...(c.zone !== undefined ? { zone: c.zone } : {}) });
  const link = (l: FloorLink): string => JSON.stringify({ from: l.from, to: l.to, ...(l.oneway ? { oneway: true } : {}) });
  return [
    '{',
    `  "format": ${JSON.stringify(floor.format)},`,
    `  "name": ${JSON.stringify(floor.name)},`,
    `  "surfaces": ${JSON.stringify(floor.surfaces)},`,
    '  "cells": [',
    floor.cells.map((c) => `    ${cell(c)}`).join(',\n'),
    '  ],',
    '  "links": [',
    floor.links.map((l) => `    ${link(l)}`).join(',\n'),
    '  ]',
    '}',
    '',
  ].join('\n');
}

function confusionText(): string {
  const rows = SURFACES.map((s) => `    ${JSON.stringify(s)}: ${JSON.stringify(CONFUSION[s])}`).join(',\n');
  return [
    '{',
    '  "format": "underfoot-confusion/1",',
    `  "surfaces": ${JSON.stringify(SURFACES)},`,
    '  "rows": {',
    rows,
    '  }',
    '}',
    '',
  ].join('\n');
}

function main(): void {
  const here = dirname(fileURLToPath(import.meta.url));
  const floor = buildQuillmoor();
  checkQuillmoor(floor);
  checkConfusion();
  const text = floorText(floor);
  const floorPath = join(here, 'floor.json');
  parseFloor(text, floorPath); // the tool's own reader must accept it
  writeFileSync(floorPath, text);
  writeFileSync(join(here, 'sensor-confusion.json'), confusionText());

  const oneway = floor.links.filter((l) => l.oneway).length;
  const moves = floor.links.reduce((k, l) => k + (l.oneway ? 1 : 2), 0);
  console.log(`wrote ${floorPath}`);
  for (const level of [...new Set(floor.cells.map((c) => c.level))].sort((a, b) => a - b)) {
    const cells = floor.cells.filter((c) => c.level === level);
    const rooms = new Set(cells.map((c) => c.id.split('-')[1]));
    console.log(`level ${level}: ${cells.length} cells in ${rooms.size} rooms`);
  }
  const zones = new Set(floor.cells.map((c) => c.zone));
  console.log(`zones ${zones.size}`);
  const bySurface = SURFACES.map((s) => `${s} ${floor.cells.filter((c) => c.surface === s).length}`).join(', ');
  console.log(`cells ${floor.cells.length} (${bySurface}); start cells ${floor.cells.filter((c) => c.start).length}`);
  console.log(`links ${floor.links.length} declared (${oneway} one-way), ${moves} directed moves`);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) main();
