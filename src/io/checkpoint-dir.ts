import { mkdir, rm, stat } from 'node:fs/promises';
import { InputError } from '../errors.js';
import { join } from 'node:path';
import type { FitCheckpoint } from '../model/fit-checkpoint-data.js';
import { parseCheckpoint } from './parse-checkpoint.js';
import { readJsonText } from './read-json-file.js';
import { writeFileAtomic } from './write-atomic.js';

const FILE = 'fit-checkpoint.json';

/**
 * A fit checkpoint kept as `fit-checkpoint.json` in a folder (`fit --checkpoint DIR`), rewritten
 * atomically after every iteration, so a killed fit leaves either the previous or the new state.
 * Numbers are written in JavaScript's shortest round-trip form, so a resumed fit continues bit for bit.
 * Read like every JSON input (`readJsonText`, `parseCheckpoint`): damage is one line naming the file.
 */
export class CheckpointDir {
  readonly where: string;

  constructor(private readonly dir: string) {
    this.where = join(dir, FILE);
  }

  async load(): Promise<FitCheckpoint | null> {
    try {
      await stat(this.where);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
    }
    try {
      return parseCheckpoint(await readJsonText(this.where), this.where);
    } catch (err) {
      if (err instanceof InputError) throw new InputError(`${err.message}; remove the checkpoint to start the fit afresh`);
      throw err;
    }
  }

  async save(checkpoint: FitCheckpoint): Promise<void> {
    await mkdir(this.dir, { recursive: true });
    await writeFileAtomic(this.where, JSON.stringify(checkpoint));
  }

  async clear(): Promise<void> {
    await rm(this.where, { force: true });
  }
}
