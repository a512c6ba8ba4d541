import { readFile } from 'node:fs/promises';
import { InputError } from '../errors.js';
import { parsePipeline } from './parse-pipeline.js';
import type { PipelineFile } from './pipeline-file.js';

/** Reads and checks a pipeline file. */
export async function readPipeline(path: string): Promise<PipelineFile> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    throw new InputError(`${path}: the pipeline file must be readable, got ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
  }
  return parsePipeline(text, path);
}
