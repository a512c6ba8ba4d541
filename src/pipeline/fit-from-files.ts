import { readFloor } from '../io/read-floor.js';
import { readModel } from '../io/read-model.js';
import { fileDigest } from '../io/file-digest.js';
import { formatModel } from '../io/format-model.js';
import { writeFileAtomic } from '../io/write-atomic.js';
import type { ModelFile } from '../io/model-file.js';
import { checkModelFloor } from '../model/check-model-floor.js';
import { withFloorZones } from '../model/with-floor-zones.js';
import { fitModel, type FitControl, type FitProgress } from '../fit/fit-model.js';
import type { QueueSetting } from './resolve-fit-options.js';
import type { QueueWait } from './queue-engine-for.js';
import type { FitOptions } from '../fit/fit-record.js';
import type { KeyColumns } from './key-columns.js';
import { loadRuns } from './load-runs.js';
import { heldOutFlags } from './held-out-flags.js';
import { CheckpointDir } from '../io/checkpoint-dir.js';
import { wasmFallbackWarning } from './wasm-fallback-warning.js';
import { planOutputs } from '../io/plan-outputs.js';

export interface FitConfig {
  floor: string;
  runs: string[];
  out: string;
  from: string | null;
  options: FitOptions;
  workers: number;
  keys: KeyColumns;
  /** Folder for the fit's checkpoint (`--checkpoint`), or null. */
  checkpoint?: string | null;
  /** Stops the fit after the current iteration (SIGINT). */
  signal?: AbortSignal;
  /** `--queue`: E-steps on workers through Redis; null or absent = in this process. */
  queue?: QueueSetting | null;
  /** Called every few seconds while the queue's workers take no block (the CLI prints a line). */
  onQueueWait?: (wait: QueueWait) => void;
}

export interface FitOutcome {
  file: ModelFile;
  warnings: string[];
  nRuns: number;
}

/** `fit`: reads the floor and runs (and a warm-start model), calibrates, writes the model file atomically. */
export async function fitFromFiles(config: FitConfig, onProgress?: (p: FitProgress) => void): Promise<FitOutcome> {
  const checkpoint = config.checkpoint ? new CheckpointDir(config.checkpoint) : undefined;
  await planOutputs(
    'fit',
    [{ path: config.floor, what: '--floor' }, ...config.runs.map((r) => ({ path: r, what: '--runs' })), { path: config.from, what: '--from' }],
    [{ path: config.out, what: '--out' }, { path: checkpoint?.where, what: '--checkpoint' }],
  );
  // Before any reading: an unreachable queue is one line, and nothing is written.
  // Loaded only for --queue, so plain fits do not load the queue's client packages.
  const queue = config.queue ? await (await import('./queue-engine-for.js')).queueEngineFor(config.queue, 'fit', config.onQueueWait) : null;
  try {
    return await fitWith(config, checkpoint, queue?.engine, onProgress);
  } finally {
    await queue?.close();
  }
}

async function fitWith(
  config: FitConfig,
  checkpoint: CheckpointDir | undefined,
  engine: FitControl['engine'],
  onProgress?: (p: FitProgress) => void,
): Promise<FitOutcome> {
  const floor = await readFloor(config.floor);
  const loaded = await loadRuns(config.runs, { surfaces: floor.surfaces, ...config.keys });
  const options = { ...config.options };
  let warmStart: Awaited<ReturnType<typeof readModel>>['model'] | undefined;
  if (config.from) {
    const from = await readModel(config.from);
    checkModelFloor(from.model, config.from, floor, config.floor);
    warmStart = from.model;
    options.fromDigest = await fileDigest(config.from);
  }
  const flags = options.holdoutCol ? heldOutFlags(loaded, options.holdoutCol) : undefined;
  const result = await fitModel(
    {
      floor,
      runs: loaded.runs,
      heldOutFlags: flags,
      floorDigest: await fileDigest(config.floor),
      runsDigests: loaded.digests,
      warmStart,
      movement: loaded.movement !== null,
    },
    options,
    config.workers,
    onProgress,
    { checkpoint, signal: config.signal, configKey: JSON.stringify(config.keys), engine },
  );
  const file: ModelFile = { name: floor.name, model: withFloorZones(result.model, floor), fit: result.record };
  await writeFileAtomic(config.out, formatModel(file));
  const warnings = [...loaded.warnings, ...wasmFallbackWarning()];
  if (loaded.movement && options.transitions !== 'tied' && options.transitions !== 'fixed' && options.transitions !== 'auto') {
    warnings.push(`fit: the odometry columns (${[loaded.movement.movedCol, loaded.movement.headingCol].filter((c) => c).join(', ')}) are ignored with --transitions ${options.transitions}; only tied and fixed use them`);
  }
  return { file, warnings, nRuns: loaded.runs.length };
}
