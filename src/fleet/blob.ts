import { WorkError } from '../errors.js';

/**
 * The one binary container every fleet payload uses (runs, models, block results): the 4-byte magic
 * `UFB1`, a u32 (little-endian) header length, the header as UTF-8 JSON, then typed arrays, each
 * starting at a multiple of 8 bytes. The header names the arrays' types and lengths (`arrays`), so a
 * reader checks every length against the payload's size before it makes a view: nothing in a payload
 * is executed, and a short or padded payload is refused.
 */
export type BlobArray = Float64Array | Int32Array;

export interface Blob<H> {
  header: H;
  arrays: BlobArray[];
}

const MAGIC = [0x55, 0x46, 0x42, 0x31]; // "UFB1"
const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

const align8 = (n: number): number => (n + 7) & ~7;

/** Packs a JSON header and typed arrays into one buffer (copies the arrays). */
export function packBlob(header: object, arrays: readonly BlobArray[]): Buffer {
  if (!LITTLE_ENDIAN) throw new WorkError('fleet: the machine must be little-endian, got big-endian');
  const described = { ...header, arrays: arrays.map((a) => [a instanceof Float64Array ? 'f64' : 'i32', a.length]) };
  const json = Buffer.from(JSON.stringify(described), 'utf8');
  let size = align8(8 + json.length);
  for (const a of arrays) size += align8(a.byteLength);
  const out = Buffer.alloc(size);
  out.set(MAGIC, 0);
  out.writeUInt32LE(json.length, 4);
  out.set(json, 8);
  let at = align8(8 + json.length);
  for (const a of arrays) {
    out.set(new Uint8Array(a.buffer, a.byteOffset, a.byteLength), at);
    at += align8(a.byteLength);
  }
  return out;
}

/**
 * Reads a buffer made by `packBlob`. `what` names the payload in messages. Throws a WorkError when
 * the bytes are not such a container or their sizes do not add up; the header's own fields are the
 * caller's to check. The arrays are fresh copies (aligned, independent of the buffer).
 */
export function unpackBlob(bytes: Uint8Array, what: string): Blob<Record<string, unknown>> {
  const bad = (got: string): never => {
    throw new WorkError(`${what}: the payload must be an underfoot fleet container, got ${got}`);
  };
  if (!LITTLE_ENDIAN) throw new WorkError('fleet: the machine must be little-endian, got big-endian');
  if (bytes.length < 8 || MAGIC.some((b, k) => bytes[k] !== b)) bad(`${bytes.length} bytes without its mark`);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const headerLength = view.getUint32(4, true);
  if (8 + headerLength > bytes.length || headerLength > 1 << 20) bad(`a header of ${headerLength} bytes in ${bytes.length}`);
  let header: unknown;
  try {
    header = JSON.parse(new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(8, 8 + headerLength)));
  } catch {
    bad('a header that is not JSON');
  }
  if (typeof header !== 'object' || header === null || Array.isArray(header)) bad('a header that is not an object');
  const h = header as Record<string, unknown>;
  const specs = h.arrays;
  if (!Array.isArray(specs) || specs.length > 64) bad('no list of arrays');
  let at = align8(8 + headerLength);
  const arrays: BlobArray[] = [];
  for (const spec of specs as unknown[]) {
    if (!Array.isArray(spec) || spec.length !== 2 || (spec[0] !== 'f64' && spec[0] !== 'i32') || !Number.isSafeInteger(spec[1]) || (spec[1] as number) < 0) {
      bad(`an array described as ${JSON.stringify(spec)}`);
    }
    const [type, length] = spec as ['f64' | 'i32', number];
    const byteLength = length * (type === 'f64' ? 8 : 4);
    if (at + byteLength > bytes.length) bad(`arrays longer than its ${bytes.length} bytes`);
    const copy = new Uint8Array(byteLength);
    copy.set(bytes.subarray(at, at + byteLength));
    arrays.push(type === 'f64' ? new Float64Array(copy.buffer) : new Int32Array(copy.buffer));
    at += align8(byteLength);
  }
  if (at !== bytes.length) bad(`${bytes.length - at} bytes after its arrays`);
  return { header: h, arrays };
}
