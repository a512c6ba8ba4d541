import { parseModel } from './parse-model.js';
import { readJsonText } from './read-json-file.js';
import type { ModelFile } from './model-file.js';

/** Reads and checks a model file (see `parseModel`); every failure is a one-line InputError. */
export async function readModel(path: string): Promise<ModelFile> {
  return parseModel(await readJsonText(path), path);
}
