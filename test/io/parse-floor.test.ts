import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { formatFloor } from '../../src/io/format-floor.js';
import { parseFloor } from '../../src/io/parse-floor.js';

// Source for every rule checked here: the file formats (docs/formats.md), "Floor file" (format name, fields,
// defaults, and the list of errors). The floor is invented ("Wrenmoor Depot").

type Json = Record<string, unknown>;

/** A valid floor: A1 <-> A2 <-> B2 -> B1 <-> A1. */
function floorDoc(): Json {
  return {
    format: 'underfoot-floor/1',
    name: 'Wrenmoor Depot, loading bay',
    surfaces: ['oak', 'carpet', 'tile'],
    cells: [
      { id: 'A1', surface: 'oak', x: 0.5, y: 0.5, level: 0, start: true },
      { id: 'A2', surface: 'oak', x: 1.5, y: 0.5 },
      { id: 'B1', surface: 'carpet', x: 0.5, y: 1.5, level: 1 },
      { id: 'B2', surface: 'tile', x: 1.5, y: 1.5 },
    ],
    links: [
      { from: 'A1', to: 'A2' },
      { from: 'A2', to: 'B2' },
      { from: 'B2', to: 'B1', oneway: true },
      { from: 'B1', to: 'A1' },
    ],
  };
}

function cells(doc: Json): Json[] {
  return doc.cells as Json[];
}

function links(doc: Json): Json[] {
  return doc.links as Json[];
}

/** Asserts that parsing `text` throws an InputError with exactly `message`, on one line. */
function expectFloorError(text: string, message: string): void {
  let caught: unknown;
  try {
    parseFloor(text, 'depot/floor.json');
  } catch (err) {
    caught = err;
  }
  expect(caught).toBeInstanceOf(InputError);
  const got = (caught as Error).message;
  expect(got).not.toMatch(/[\r\n]/);
  expect(got.startsWith('depot/floor.json: ')).toBe(true);
  expect(got).toBe(message);
}

function expectDocError(edit: (doc: Json) => void, message: string): void {
  const doc = floorDoc();
  edit(doc);
  expectFloorError(JSON.stringify(doc, null, 2), message);
}

describe('parseFloor(text, source) on a valid file', () => {
  it('parseFloor(text) keeps the cell and link order and fills the defaults level 0, start false, oneway false', () => {
    const floor = parseFloor(JSON.stringify(floorDoc()), 'floor.json');
    expect(floor.format).toBe('underfoot-floor/1');
    expect(floor.name).toBe('Wrenmoor Depot, loading bay');
    expect(floor.surfaces).toEqual(['oak', 'carpet', 'tile']);
    expect(floor.cells.map((c) => c.id)).toEqual(['A1', 'A2', 'B1', 'B2']);
    expect(floor.cells[1]).toEqual({ id: 'A2', surface: 'oak', x: 1.5, y: 0.5, level: 0, start: false });
    expect(floor.cells[2].level).toBe(1);
    expect(floor.cells[0].start).toBe(true);
    expect(floor.links).toEqual([
      { from: 'A1', to: 'A2', oneway: false },
      { from: 'A2', to: 'B2', oneway: false },
      { from: 'B2', to: 'B1', oneway: true },
      { from: 'B1', to: 'A1', oneway: false },
    ]);
  });

  it('parseFloor(text) accepts a leading byte-order mark', () => {
    const floor = parseFloor(`\ufeff${JSON.stringify(floorDoc())}`, 'floor.json');
    expect(floor.cells).toHaveLength(4);
  });

  it('parseFloor(text) accepts two one-way links in opposite directions between the same cells', () => {
    const doc = floorDoc();
    links(doc).push({ from: 'B1', to: 'B2', oneway: true });
    expect(parseFloor(JSON.stringify(doc), 'floor.json').links).toHaveLength(5);
  });

  it('parseFloor(text) counts a two-way link as a way out of both its cells', () => {
    // C1's only link names it as "to": two-way, so C1 can leave along it.
    const doc = floorDoc();
    cells(doc).push({ id: 'C1', surface: 'tile', x: 3, y: 3 });
    links(doc).push({ from: 'B2', to: 'C1' });
    expect(parseFloor(JSON.stringify(doc), 'floor.json').cells.map((c) => c.id)).toContain('C1');
  });

  it('parseFloor(text) keeps zones and the georeference; formatFloor writes them back (and nothing when absent)', () => {
    const doc = floorDoc();
    cells(doc)[0].zone = 'Loading bay';
    cells(doc)[1].zone = 'Loading bay';
    cells(doc)[2].zone = 'Cold store (level 1)';
    doc.georeference = { lat: -33.5, lon: 151.25, bearing: 359.5 };
    const floor = parseFloor(JSON.stringify(doc), 'floor.json');
    expect(floor.cells.map((c) => c.zone)).toEqual(['Loading bay', 'Loading bay', 'Cold store (level 1)', undefined]);
    expect('zone' in floor.cells[3]).toBe(false);
    expect(floor.georeference).toEqual({ lat: -33.5, lon: 151.25, bearing: 359.5 });
    expect(parseFloor(formatFloor(floor), 'again.json')).toEqual(floor);
    const plain = parseFloor(JSON.stringify(floorDoc()), 'floor.json');
    expect('georeference' in plain).toBe(false);
    expect(formatFloor(plain)).not.toMatch(/zone|georeference/);
  });

  it('parseFloor(text) keeps ids and surfaces as written, spaces included', () => {
    const doc = floorDoc();
    (doc.surfaces as string[]).push(' oak');
    cells(doc)[3].surface = ' oak';
    expect(parseFloor(JSON.stringify(doc), 'floor.json').cells[3].surface).toBe(' oak');
  });
});

describe('parseFloor(text, source) errors (one per case in the contract)', () => {
  it('parseFloor(text) rejects text that is not JSON, with line and column', () => {
    // Source for the position: the "}" is on line 3, column 1 of this text.
    expectFloorError(
      '{\n  "format": "underfoot-floor/1",\n}',
      'depot/floor.json: file must be valid JSON, got an unexpected "}" where a double-quoted key should be at line 3, column 1',
    );
  });

  it('parseFloor(text) rejects a key written twice in one object', () => {
    expectFloorError(
      '{"format": "underfoot-floor/1", "cells": [{"id": "A1", "id": "A2"}]}',
      'depot/floor.json: each object must name a key once, got the key "id" twice in one object at line 1, column 56',
    );
  });

  it('parseFloor(text) rejects a top level that is not an object', () => {
    expectFloorError('[]', 'depot/floor.json: top level must be a JSON object, got an empty list');
  });

  it('parseFloor(text) rejects a wrong format', () => {
    expectDocError(
      (doc) => (doc.format = 'underfoot-model/1'),
      'depot/floor.json: "format" must be "underfoot-floor/1", got "underfoot-model/1"',
    );
  });

  it('parseFloor(text) rejects a missing format', () => {
    expectDocError((doc) => delete doc.format, 'depot/floor.json: "format" must be "underfoot-floor/1", got nothing');
  });

  it('parseFloor(text) rejects an unknown top-level key', () => {
    expectDocError(
      (doc) => (doc.link = []),
      'depot/floor.json: top-level key must be one of "format", "name", "surfaces", "cells", "links", "georeference", got "link"',
    );
  });

  it('parseFloor(text) rejects a missing name', () => {
    expectDocError((doc) => delete doc.name, 'depot/floor.json: "name" must be a string of well-formed text, got nothing');
  });

  it('parseFloor(text) rejects a name that is not a string', () => {
    expectDocError((doc) => (doc.name = 7), 'depot/floor.json: "name" must be a string of well-formed text, got 7');
  });

  it('parseFloor(text) rejects missing surfaces', () => {
    expectDocError(
      (doc) => delete doc.surfaces,
      'depot/floor.json: "surfaces" must be a non-empty list of surface names, got nothing',
    );
  });

  it('parseFloor(text) rejects an empty surfaces list', () => {
    expectDocError(
      (doc) => (doc.surfaces = []),
      'depot/floor.json: "surfaces" must be a non-empty list of surface names, got an empty list',
    );
  });

  it('parseFloor(text) rejects a surface that is not a non-empty string', () => {
    expectDocError(
      (doc) => (doc.surfaces = ['oak', '', 'tile']),
      'depot/floor.json: surfaces[1] must be a non-empty string, got ""',
    );
  });

  it('parseFloor(text) rejects a surface listed twice', () => {
    expectDocError(
      (doc) => (doc.surfaces = ['oak', 'carpet', 'tile', 'carpet']),
      'depot/floor.json: surfaces[3] must be unique, got "carpet" again (also surfaces[1])',
    );
  });

  it('parseFloor(text) rejects a floor with no cells', () => {
    expectDocError(
      (doc) => (doc.cells = []),
      'depot/floor.json: "cells" must be a non-empty list of cells, got an empty list',
    );
  });

  it('parseFloor(text) rejects a cell that is not an object', () => {
    expectDocError((doc) => cells(doc).push('C1' as unknown as Json), 'depot/floor.json: cells[4] must be an object, got "C1"');
  });

  it('parseFloor(text) rejects a cell without an id', () => {
    expectDocError(
      (doc) => delete cells(doc)[2].id,
      'depot/floor.json: cells[2] "id" must be a non-empty string, got nothing',
    );
  });

  it('parseFloor(text) rejects a cell id that is not a string', () => {
    expectDocError((doc) => (cells(doc)[2].id = 12), 'depot/floor.json: cells[2] "id" must be a non-empty string, got 12');
  });

  it('parseFloor(text) rejects a duplicate cell id', () => {
    expectDocError(
      (doc) => (cells(doc)[3].id = 'A2'),
      'depot/floor.json: cell "A2" (cells[3]) "id" must be unique, got "A2" again (also cells[1])',
    );
  });

  it('parseFloor(text) rejects an unknown key in a cell', () => {
    expectDocError(
      (doc) => (cells(doc)[1].levle = 2),
      'depot/floor.json: cell "A2" (cells[1]) key must be one of "id", "surface", "x", "y", "level", "start", "zone", got "levle"',
    );
  });

  it('parseFloor(text) rejects a cell without a surface', () => {
    expectDocError(
      (doc) => delete cells(doc)[1].surface,
      'depot/floor.json: cell "A2" (cells[1]) "surface" must be a string, got nothing',
    );
  });

  it('parseFloor(text) rejects a cell surface not in surfaces', () => {
    expectDocError(
      (doc) => (cells(doc)[3].surface = 'marble'),
      'depot/floor.json: cell "B2" (cells[3]) "surface" must be one of the surfaces (oak, carpet, tile), got "marble"',
    );
  });

  it('parseFloor(text) rejects a cell without x', () => {
    expectDocError(
      (doc) => delete cells(doc)[0].x,
      'depot/floor.json: cell "A1" (cells[0]) "x" must be a finite number of metres within ±1000000000, got nothing',
    );
  });

  it('parseFloor(text) rejects a y that is text', () => {
    expectDocError(
      (doc) => (cells(doc)[0].y = '0.5'),
      'depot/floor.json: cell "A1" (cells[0]) "y" must be a finite number of metres within ±1000000000, got "0.5"',
    );
  });

  it('parseFloor(text) rejects an x too large to be finite', () => {
    const text = JSON.stringify(floorDoc()).replace('"x":1.5', '"x":1e999');
    expectFloorError(text, 'depot/floor.json: cell "A2" (cells[1]) "x" must be a finite number of metres within ±1000000000, got Infinity');
  });

  it('parseFloor(text) rejects a level that is not an integer', () => {
    expectDocError(
      (doc) => (cells(doc)[2].level = 1.5),
      'depot/floor.json: cell "B1" (cells[2]) "level" must be an integer, got 1.5',
    );
  });

  it('parseFloor(text) rejects a null level rather than defaulting it', () => {
    expectDocError(
      (doc) => (cells(doc)[2].level = null),
      'depot/floor.json: cell "B1" (cells[2]) "level" must be an integer, got null',
    );
  });

  it('parseFloor(text) rejects a start that is not true or false', () => {
    expectDocError(
      (doc) => (cells(doc)[0].start = 'yes'),
      'depot/floor.json: cell "A1" (cells[0]) "start" must be true or false, got "yes"',
    );
  });

  it('parseFloor(text) rejects missing links', () => {
    expectDocError((doc) => delete doc.links, 'depot/floor.json: "links" must be a list of links, got nothing');
  });

  it('parseFloor(text) rejects a link that is not an object', () => {
    expectDocError((doc) => (links(doc)[1] = ['A2', 'B2'] as unknown as Json), 'depot/floor.json: links[1] must be an object, got ["A2","B2"]');
  });

  it('parseFloor(text) rejects an unknown key in a link', () => {
    expectDocError(
      (doc) => (links(doc)[2].one_way = true),
      'depot/floor.json: links[2] key must be one of "from", "to", "oneway", got "one_way"',
    );
  });

  it('parseFloor(text) rejects a link without a from', () => {
    expectDocError((doc) => delete links(doc)[0].from, 'depot/floor.json: links[0] "from" must be a cell id, got nothing');
  });

  it('parseFloor(text) rejects a link from an unknown cell', () => {
    expectDocError(
      (doc) => (links(doc)[1].from = 'Z9'),
      'depot/floor.json: link "Z9" <-> "B2" (links[1]) "from" must be the id of a cell, got "Z9"',
    );
  });

  it('parseFloor(text) rejects a link to an unknown cell', () => {
    expectDocError(
      (doc) => (links(doc)[2].to = 'B7'),
      'depot/floor.json: link "B2" -> "B7" (links[2]) "to" must be the id of a cell, got "B7"',
    );
  });

  it('parseFloor(text) rejects a link to itself', () => {
    expectDocError(
      (doc) => links(doc).push({ from: 'A2', to: 'A2' }),
      'depot/floor.json: link "A2" <-> "A2" (links[4]) must join two different cells, got a link from "A2" to itself',
    );
  });

  it('parseFloor(text) rejects the same link declared twice', () => {
    expectDocError(
      (doc) => links(doc).push({ from: 'A1', to: 'A2' }),
      'depot/floor.json: link "A1" <-> "A2" (links[4]) must be declared once, got the same move as links[0] "A1" <-> "A2"',
    );
  });

  it('parseFloor(text) rejects a two-way link that repeats the reverse of another', () => {
    expectDocError(
      (doc) => links(doc).push({ from: 'A2', to: 'A1' }),
      'depot/floor.json: link "A2" <-> "A1" (links[4]) must be declared once, got the same move as links[0] "A1" <-> "A2"',
    );
  });

  it('parseFloor(text) rejects a one-way link already covered by a two-way link', () => {
    expectDocError(
      (doc) => links(doc).push({ from: 'B2', to: 'A2', oneway: true }),
      'depot/floor.json: link "B2" -> "A2" (links[4]) must be declared once, got the same move as links[1] "A2" <-> "B2"',
    );
  });

  it('parseFloor(text) rejects a oneway that is not true or false', () => {
    expectDocError(
      (doc) => (links(doc)[2].oneway = 1),
      'depot/floor.json: link "B2" -> "B1" (links[2]) "oneway" must be true or false, got 1',
    );
  });

  it('parseFloor(text) rejects a cell with no links (the dwell does not count as a way out)', () => {
    expectDocError(
      (doc) => cells(doc).push({ id: 'C1', surface: 'tile', x: 3, y: 3 }),
      'depot/floor.json: cell "C1" (cells[4]) must have a way out (a link leaving it), got no links',
    );
  });

  it('parseFloor(text) rejects a cell reached only by one-way links into it', () => {
    expectDocError(
      (doc) => {
        cells(doc).push({ id: 'C1', surface: 'tile', x: 3, y: 3 });
        links(doc).push({ from: 'B2', to: 'C1', oneway: true });
      },
      'depot/floor.json: cell "C1" (cells[4]) must have a way out (a link leaving it), got only one-way links into it (1)',
    );
  });
});
