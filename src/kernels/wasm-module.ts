import { uleb, type WasmFunction } from './wasm-function.js';

/**
 * The bytes of a WebAssembly module that imports one linear memory as `env.memory` and exports the given
 * functions by name (WebAssembly Core Specification 2.0, section 5.5 "Modules": magic and version, then
 * the type, import, function, export and code sections, in that order).
 */
export function wasmModule(functions: ReadonlyArray<{ name: string; fn: WasmFunction }>): Uint8Array<ArrayBuffer> {
  const name = (s: string): number[] => {
    const bytes = Array.from(new TextEncoder().encode(s));
    return [...uleb(bytes.length), ...bytes];
  };
  const vector = (items: number[][]): number[] => [...uleb(items.length), ...items.flat()];
  const section = (id: number, content: number[]): number[] => [id, ...uleb(content.length), ...content];
  const types = functions.map((f) => f.fn.encodeType());
  const memoryImport = [...name('env'), ...name('memory'), 0x02, 0x00, ...uleb(1)]; // memory, min 1 page, no max
  const bytes = [
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    ...section(1, vector(types)),
    ...section(2, vector([memoryImport])),
    ...section(3, vector(functions.map((_, i) => uleb(i)))),
    ...section(7, vector(functions.map((f, i) => [...name(f.name), 0x00, ...uleb(i)]))),
    ...section(10, vector(functions.map((f) => f.fn.encodeBody()))),
  ];
  return new Uint8Array(bytes);
}
