import { readFile } from 'node:fs/promises';
import { InputError } from '../errors.js';
import { parseModel } from './parse-model.js';
import type { ModelFile } from './model-file.js';

/** Reads and checks a model file. */
export async function readModel(path: string): Promise<ModelFile> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    throw new InputError(`${path}: the model file must be readable, got ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
  }
  return parseModel(text, path);
}
