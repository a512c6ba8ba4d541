import { describe, expect, it } from 'vitest';
import { locateJsonError } from '../../src/io/locate-json-error.js';

// Source: RFC 8259 "The JavaScript Object Notation (JSON) Data Interchange Format", sections 2-7
// (grammar of values, objects, arrays, numbers and strings). Section 4 says names within an object
// SHOULD be unique; the scanner reports repeats.

describe('locateJsonError(text)', () => {
  it('locateJsonError(text) finds nothing wrong in valid JSON texts from RFC 8259 section 13', () => {
    // Source: RFC 8259, section 13 (Examples), the image object and the array of two objects, abridged.
    const image = `{
      "Image": {
          "Width":  800,
          "Height": 600,
          "Title":  "View from 15th Floor",
          "Thumbnail": { "Url": "http://www.example.com/image/481989943", "Height": 125, "Width": 100 },
          "Animated" : false,
          "IDs": [116, 943, 234, 38793]
        }
    }`;
    const places = `[
      { "precision": "zip", "Latitude": 37.7668, "Longitude": -122.3959, "Address": "", "Zip": "94107" },
      { "precision": "zip", "Latitude": 37.371991, "Longitude": -122.026020, "Zip": "94085" }
    ]`;
    for (const text of [image, places, '"Hello world!"', '42', 'true', 'null', '-0.5e+3', '"\\u00e9\\n"', '{}', '[]']) {
      expect(locateJsonError(text)).toBeNull();
      expect(() => JSON.parse(text)).not.toThrow();
    }
  });

  it('locateJsonError(text) agrees with JSON.parse on invalid texts and gives line and column', () => {
    const cases: Array<[string, number, number]> = [
      ['{"a": 1,}', 1, 9],
      ['[1,\n 2,\n ]', 3, 2],
      ['{"a" 1}', 1, 6],
      ['{"a": 01}', 1, 7],
      ['{"a": 1.}', 1, 7],
      ['{"a": tru}', 1, 7],
      ['"tab\there"', 1, 5],
      ['"\\x"', 1, 2],
      ['{"a": 1} x', 1, 10],
      ['', 1, 1],
      ['[1, 2', 1, 6],
      ['{"a": "open}', 1, 7],
      ['\r\n\r\n  @', 3, 3],
    ];
    for (const [text, line, column] of cases) {
      expect(() => JSON.parse(text)).toThrow();
      const problem = locateJsonError(text);
      expect(problem, text).not.toBeNull();
      expect(problem?.kind).toBe('syntax');
      expect([problem?.line, problem?.column], text).toEqual([line, column]);
    }
  });

  it('locateJsonError(text) reports a key repeated in one object but not across objects', () => {
    expect(locateJsonError('[{"id": 1}, {"id": 2}]')).toBeNull();
    const problem = locateJsonError('{"id": 1,\n "id": 2}');
    expect(problem).toMatchObject({ kind: 'repeated-key', line: 2, column: 2 });
    // "\u0069d" is the key "id" written with an escape.
    expect(locateJsonError('{"id": 1, "\\u0069d": 2}')?.kind).toBe('repeated-key');
  });

  it('locateJsonError(text) stops at very deep nesting instead of overflowing the stack', () => {
    const deep = '['.repeat(100_000);
    expect(locateJsonError(deep)?.what).toMatch(/nesting deeper than/);
  });
});
