import { mkdir, readFile, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { InputError, quote } from '../errors.js';
import type { CheckpointStore, FitCheckpoint } from '../fit/fit-checkpoint.js';
import { writeFileAtomic } from './write-atomic.js';

const FILE = 'fit-checkpoint.json';

/**
 * A fit checkpoint kept as `fit-checkpoint.json` in a folder (`fit --checkpoint DIR`), rewritten
 * atomically after every iteration, so a killed fit leaves either the previous or the new state.
 * Numbers are written in JavaScript's shortest round-trip form, so a resumed fit continues bit for bit.
 */
export class CheckpointDir implements CheckpointStore {
  readonly where: string;

  constructor(private readonly dir: string) {
    this.where = join(dir, FILE);
  }

  async load(): Promise<FitCheckpoint | null> {
    let text: string;
    try {
      text = await readFile(this.where, 'utf8');
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
      throw new InputError(`${this.where}: the checkpoint must be readable, got ${(err as NodeJS.ErrnoException).code ?? String(err)}`);
    }
    let doc: FitCheckpoint;
    try {
      doc = JSON.parse(text) as FitCheckpoint;
    } catch {
      throw new InputError(`${this.where}: the checkpoint must be valid JSON, got a damaged file; remove it to start the fit afresh`);
    }
    if (doc?.format !== 'underfoot-fit-checkpoint/1' || typeof doc.key !== 'string' || !Array.isArray(doc.done)) {
      throw new InputError(`${this.where}: the checkpoint must be an underfoot-fit-checkpoint/1 file, got ${quote(doc?.format)}`);
    }
    return doc;
  }

  async save(checkpoint: FitCheckpoint): Promise<void> {
    await mkdir(this.dir, { recursive: true });
    await writeFileAtomic(this.where, JSON.stringify(checkpoint));
  }

  async clear(): Promise<void> {
    await rm(this.where, { force: true });
  }
}
