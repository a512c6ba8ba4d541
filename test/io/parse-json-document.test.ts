import { describe, it, expect } from 'vitest';
import { parseJsonDocument } from '../../src/io/parse-json-document.js';
import { parseCheckpoint } from '../../src/io/parse-checkpoint.js';
import { parseModel } from '../../src/io/parse-model.js';
import { parsePipeline } from '../../src/io/parse-pipeline.js';

const nested = (depth: number): string => '['.repeat(depth) + ']'.repeat(depth);

describe('parseJsonDocument(text, source): the scanner runs before JSON.parse', () => {
  it('accepts nesting of 64 levels and refuses 65, with line and column', () => {
    expect(parseJsonDocument(nested(64), 'x.json')).toBeInstanceOf(Array);
    expect(() => parseJsonDocument(nested(65), 'x.json')).toThrow('x.json: file must be valid JSON, got nesting deeper than 64 levels at line 1, column 65');
  });
  it('refuses a key given twice even where JSON.parse would accept it (last one wins)', () => {
    expect(() => parseJsonDocument('{"a": 1,\n"a": 2}', 'x.json')).toThrow('x.json: each object must name a key once, got the key "a" twice in one object at line 2, column 1');
  });
  it('drops a byte-order mark', () => {
    expect(parseJsonDocument('\ufeff{"a": 1}', 'x.json')).toEqual({ a: 1 });
  });
  it('model, pipeline and checkpoint parsers all refuse a repeated key the same way', () => {
    const dup = '{"format": "x", "format": "y"}';
    for (const parse of [parseModel, parsePipeline, parseCheckpoint]) {
      expect(() => parse(dup, 'f.json')).toThrow('f.json: each object must name a key once, got the key "format" twice in one object at line 1, column 17');
    }
  });
});

describe('parseCheckpoint(text, source)', () => {
  const valid = {
    format: 'underfoot-fit-checkpoint/1',
    key: 'sha256:0',
    done: [],
    current: { phase: 'restart', index: 0, iterations: 1, history: [-1.5], params: { start: [1], trans: [1], emission: [0.5, 0.5] } },
  };
  it('reads a valid checkpoint', () => {
    expect(parseCheckpoint(JSON.stringify(valid), 'cp.json')).toEqual(valid);
  });
  const bad: Array<[string, (cp: any) => void, string]> = [
    ['an unknown key', (cp) => (cp.extra = 1), 'cp.json: the checkpoint key must be one of "format", "key", "done", "current", got "extra"'],
    ['a probability above 1', (cp) => (cp.current.params.start = [1.5]), 'cp.json: current.params.start[0] must be a probability in [0, 1], got 1.5'],
    ['a phase that does not exist', (cp) => (cp.current.phase = 'middle'), 'cp.json: current.phase must be "restart" or "final", got "middle"'],
    ['a history that is not numbers', (cp) => (cp.current.history = [null]), 'cp.json: current.history[0] must be a finite number, got null'],
    ['a negative iteration count', (cp) => (cp.current.iterations = -1), 'cp.json: current.iterations must be a whole number from 0 up, got -1'],
  ];
  for (const [what, change, message] of bad) {
    it(`refuses ${what} in one line`, () => {
      const cp = structuredClone(valid);
      change(cp);
      expect(() => parseCheckpoint(JSON.stringify(cp), 'cp.json')).toThrow(message);
    });
  }
});
