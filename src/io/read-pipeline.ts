import { parsePipeline } from './parse-pipeline.js';
import { readJsonText } from './read-json-file.js';
import type { PipelineFile } from './pipeline-file.js';

/** Reads and checks a pipeline file (see `parsePipeline`); every failure is a one-line InputError. */
export async function readPipeline(path: string): Promise<PipelineFile> {
  return parsePipeline(await readJsonText(path), path);
}
