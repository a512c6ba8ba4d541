/**
 * Finds the first problem in a JSON text, with its line and column, so a message can point at it.
 * `JSON.parse` reports positions only for some errors (and not in a stable wording) and silently keeps
 * the last of two equal keys; this scanner checks the grammar of RFC 8259 (section 2 to 7) and also
 * reports a key repeated within one object.
 */
export interface JsonProblem {
  kind: 'syntax' | 'repeated-key';
  /** Short description, e.g. `an unexpected "}"` or `the key "id" twice in one object`. */
  what: string;
  /** Character offset (0-based) into the text. */
  offset: number;
  /** 1-based line and column of `offset`. */
  line: number;
  column: number;
}

/** Nesting deeper than this is reported rather than risking the call stack. */
export const MAX_JSON_DEPTH = 64;

class Problem {
  constructor(
    readonly kind: JsonProblem['kind'],
    readonly what: string,
    readonly offset: number,
  ) {}
}

/** Returns the first problem in `text`, or `null` when it is valid JSON without repeated keys. */
export function locateJsonError(text: string): JsonProblem | null {
  try {
    const end = scanValue(text, skipSpace(text, 0), 0);
    const after = skipSpace(text, end);
    if (after < text.length) throw new Problem('syntax', `${describeAt(text, after)} after the end of the JSON value`, after);
    return null;
  } catch (err) {
    if (!(err instanceof Problem)) throw err;
    const { line, column } = lineAndColumn(text, err.offset);
    return { kind: err.kind, what: err.what, offset: err.offset, line, column };
  }
}

function lineAndColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < offset && i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || (c === 13 && text.charCodeAt(i + 1) !== 10)) {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: offset - lineStart + 1 };
}

function describeAt(text: string, pos: number): string {
  if (pos >= text.length) return 'the end of the text';
  const c = text.charCodeAt(pos);
  if (c < 0x20) return `a control character (code ${c})`;
  return `an unexpected ${JSON.stringify(text[pos])}`;
}

function skipSpace(text: string, pos: number): number {
  for (;;) {
    const c = text.charCodeAt(pos);
    if (c === 32 || c === 9 || c === 10 || c === 13) pos++;
    else return pos;
  }
}

/** Scans one value starting at `pos` (no leading space) and returns the offset just after it. */
function scanValue(text: string, pos: number, depth: number): number {
  const c = text.charCodeAt(pos);
  if (c === 123 /* { */) return scanObject(text, pos, depth + 1);
  if (c === 91 /* [ */) return scanArray(text, pos, depth + 1);
  if (c === 34 /* " */) return scanString(text, pos);
  if (c === 45 /* - */ || (c >= 48 && c <= 57)) return scanNumber(text, pos);
  for (const word of ['true', 'false', 'null']) {
    if (text.startsWith(word, pos)) return pos + word.length;
  }
  throw new Problem('syntax', `${describeAt(text, pos)} where a value should start`, pos);
}

function checkDepth(pos: number, depth: number): void {
  if (depth > MAX_JSON_DEPTH) throw new Problem('syntax', `nesting deeper than ${MAX_JSON_DEPTH} levels`, pos);
}

function scanObject(text: string, pos: number, depth: number): number {
  checkDepth(pos, depth);
  pos = skipSpace(text, pos + 1);
  if (text.charCodeAt(pos) === 125 /* } */) return pos + 1;
  const keys = new Set<string>();
  for (;;) {
    if (text.charCodeAt(pos) !== 34) {
      throw new Problem('syntax', `${describeAt(text, pos)} where a double-quoted key should be`, pos);
    }
    const keyEnd = scanString(text, pos);
    const key = JSON.parse(text.slice(pos, keyEnd)) as string;
    if (keys.has(key)) throw new Problem('repeated-key', `the key ${JSON.stringify(key)} twice in one object`, pos);
    keys.add(key);
    pos = skipSpace(text, keyEnd);
    if (text.charCodeAt(pos) !== 58 /* : */) {
      throw new Problem('syntax', `${describeAt(text, pos)} where ":" should follow a key`, pos);
    }
    pos = scanValue(text, skipSpace(text, pos + 1), depth);
    pos = skipSpace(text, pos);
    const c = text.charCodeAt(pos);
    if (c === 125) return pos + 1;
    if (c !== 44 /* , */) throw new Problem('syntax', `${describeAt(text, pos)} where "," or "}" should be`, pos);
    pos = skipSpace(text, pos + 1);
  }
}

function scanArray(text: string, pos: number, depth: number): number {
  checkDepth(pos, depth);
  pos = skipSpace(text, pos + 1);
  if (text.charCodeAt(pos) === 93 /* ] */) return pos + 1;
  for (;;) {
    pos = skipSpace(text, scanValue(text, pos, depth));
    const c = text.charCodeAt(pos);
    if (c === 93) return pos + 1;
    if (c !== 44) throw new Problem('syntax', `${describeAt(text, pos)} where "," or "]" should be`, pos);
    pos = skipSpace(text, pos + 1);
  }
}

function isHex(c: number): boolean {
  return (c >= 48 && c <= 57) || (c >= 65 && c <= 70) || (c >= 97 && c <= 102);
}

function scanString(text: string, start: number): number {
  let pos = start + 1;
  for (;;) {
    if (pos >= text.length) throw new Problem('syntax', 'a string that is never closed', start);
    const c = text.charCodeAt(pos);
    if (c === 34) return pos + 1;
    if (c < 0x20) throw new Problem('syntax', `a control character (code ${c}) inside a string`, pos);
    if (c === 92 /* \ */) {
      const e = text.charCodeAt(pos + 1);
      if (e === 117 /* u */) {
        for (let k = 2; k < 6; k++) {
          if (!isHex(text.charCodeAt(pos + k))) throw new Problem('syntax', 'a "\\u" escape without four hex digits', pos);
        }
        pos += 6;
        continue;
      }
      // " \ / b f n r t
      if (![34, 92, 47, 98, 102, 110, 114, 116].includes(e)) {
        throw new Problem('syntax', `an unknown escape ${JSON.stringify(text.slice(pos, pos + 2))} in a string`, pos);
      }
      pos += 2;
      continue;
    }
    pos++;
  }
}

function scanDigits(text: string, pos: number): number {
  while (pos < text.length) {
    const c = text.charCodeAt(pos);
    if (c < 48 || c > 57) break;
    pos++;
  }
  return pos;
}

function scanNumber(text: string, start: number): number {
  let pos = start;
  if (text.charCodeAt(pos) === 45) pos++;
  const c = text.charCodeAt(pos);
  if (c === 48) {
    pos++;
    if (scanDigits(text, pos) > pos) throw new Problem('syntax', 'a number with a leading zero', start);
  } else if (c >= 49 && c <= 57) {
    pos = scanDigits(text, pos);
  } else {
    throw new Problem('syntax', 'a "-" without digits after it', start);
  }
  if (text.charCodeAt(pos) === 46 /* . */) {
    const digits = scanDigits(text, pos + 1);
    if (digits === pos + 1) throw new Problem('syntax', 'a number with no digits after its "."', start);
    pos = digits;
  }
  const e = text.charCodeAt(pos);
  if (e === 101 || e === 69 /* e E */) {
    pos++;
    const s = text.charCodeAt(pos);
    if (s === 43 || s === 45) pos++;
    const digits = scanDigits(text, pos);
    if (digits === pos) throw new Problem('syntax', 'a number with no digits in its exponent', start);
    pos = digits;
  }
  return pos;
}
