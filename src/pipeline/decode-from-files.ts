import { InputError, quote } from '../errors.js';
import { readModel } from '../io/read-model.js';
import { readFloor } from '../io/read-floor.js';
import { writeTable } from '../io/write-table.js';
import { planOutputs } from '../io/plan-outputs.js';
import { outputTableFormatOf, tableCompression } from '../io/table-compression.js';
import { isGeoJsonPath, writeGeoJson } from '../io/write-geojson.js';
import { floorToWgs84 } from '../model/floor-to-wgs84.js';
import type { Georeference } from '../model/floor-graph.js';
import type { ModelFile } from '../io/model-file.js';
import { checkModelFloor } from '../model/check-model-floor.js';
import { withFloorZones } from '../model/with-floor-zones.js';
import type { DecodeThresholds } from '../decode/decode-thresholds.js';
import type { KeyColumns } from './key-columns.js';
import { loadRuns } from './load-runs.js';
import { decodeRuns, type DecodedTables } from './decode-runs.js';
import { wasmFallbackWarning } from './wasm-fallback-warning.js';
import { fileDigest } from '../io/file-digest.js';
import { TOOL_VERSION } from '../version.js';

/** The caution stored in Arrow/Parquet metadata and printed by the CLI with every decode (test/cli/annotated-metadata.test.ts). */
export const SAFETY_CAUTION =
  'Decoded positions are statistical estimates, not a safety function: never use them for collision avoidance or safety decisions; robot safety rests on the robot\'s own certified systems and local codes.';

export interface DecodeConfig {
  model: string;
  /** Optional floor to check the model against. */
  floor: string | null;
  runs: string[];
  out: string;
  summary: string | null;
  thresholds: DecodeThresholds;
  keys: KeyColumns;
}

export interface DecodeOutcome {
  decoded: DecodedTables;
  warnings: string[];
  nRuns: number;
  nRows: number;
}

/** `decode`: reads a model and runs, decodes every run, writes the annotated table and run summary atomically. */
export async function decodeFromFiles(config: DecodeConfig, preloaded?: ModelFile, skipAnnotated = false): Promise<DecodeOutcome> {
  // Every output's format and location is checked before anything is read.
  const geo = !skipAnnotated && isGeoJsonPath(config.out);
  if (geo && tableCompression() !== null) {
    throw new InputError(`${config.out}: --compression must go with an Arrow (.arrow, .feather, .arrows) or Parquet output, got a GeoJSON output`);
  }
  if (!skipAnnotated && !geo) outputTableFormatOf(config.out);
  if (config.summary) outputTableFormatOf(config.summary);
  await planOutputs(
    'decode',
    [{ path: config.model, what: '--model' }, { path: config.floor, what: '--floor' }, ...config.runs.map((r) => ({ path: r, what: '--runs' }))],
    [{ path: skipAnnotated ? null : config.out, what: '--out' }, { path: config.summary, what: '--summary' }],
  );
  let file = preloaded ?? (await readModel(config.model));
  let georeference: Georeference | null = null;
  if (config.floor) {
    const floor = await readFloor(config.floor);
    georeference = floor.georeference ?? null;
    checkModelFloor(file.model, config.model, floor, config.floor);
    file = { ...file, model: withFloorZones(file.model, floor) };
  }
  const loaded = await loadRuns(config.runs, { surfaces: file.model.surfaces, ...config.keys });
  const names = loaded.tables[0].columns.map((c) => c.name).join(',');
  for (const t of loaded.tables.slice(1)) {
    if (t.columns.map((c) => c.name).join(',') !== names) {
      throw new InputError(`${t.source}: runs tables decoded together must have the same columns, got ${quote(t.columns.map((c) => c.name).join(','))} and ${quote(names)} in ${loaded.tables[0].source}`);
    }
  }
  const fitRuns = new Set(file.fit?.split.fit ?? []);
  const heldRuns = new Set(file.fit?.split.heldOut ?? []);
  const movesByRun = new Map(loaded.runs.map((r) => [`${r.table}:${r.run}`, r.moves] as const));
  const decoded = decodeRuns(
    file.model,
    loaded.tables,
    config.thresholds,
    (run) => (heldRuns.has(run) ? 'held-out' : fitRuns.has(run) ? 'fit' : 'unseen'),
    (table, run) => movesByRun.get(`${table}:${run}`),
  );
  const warnings = [...loaded.warnings];
  if (loaded.movement && !file.model.movement) {
    warnings.push(`decode: the odometry columns (${[loaded.movement.movedCol, loaded.movement.headingCol].filter((c) => c).join(', ')}) are ignored: the model has no movement parameters (fit it with them, --transitions tied or fixed)`);
  }
  if (decoded.impossibleRuns.length) {
    warnings.push(`${decoded.impossibleRuns.length} run(s) are impossible under the model and were not decoded: ${decoded.impossibleRuns.slice(0, 10).join(', ')}`);
  }
  warnings.push(...wasmFallbackWarning());
  // Arrow and Parquet outputs describe themselves: tool version, model digest, thresholds, the caution.
  const metadata: Record<string, string> = {
    'underfoot.version': TOOL_VERSION,
    'underfoot.model_sha256': preloaded ? '' : await fileDigest(config.model),
    'underfoot.thresholds': JSON.stringify(config.thresholds),
    'underfoot.caution': SAFETY_CAUTION,
    ...(loaded.tables[0].timeCol !== undefined ? { 'underfoot.time': JSON.stringify({ timeCol: loaded.tables[0].timeCol, periodSeconds: loaded.tables[0].period }) } : {}),
  };
  if (!metadata['underfoot.model_sha256']) delete metadata['underfoot.model_sha256'];
  decoded.annotated.metadata = { ...metadata, 'underfoot.table': 'annotated' };
  decoded.summary.metadata = { ...metadata, 'underfoot.table': 'run summary' };
  if (geo) {
    await writeGeoJson(config.out, decoded.annotated, {
      xColumn: 'path_x',
      yColumn: 'path_y',
      toLonLat: georeference ? (x, y) => floorToWgs84(georeference, x, y) : null,
      about: {
        version: TOOL_VERSION,
        ...(metadata['underfoot.model_sha256'] ? { model_sha256: metadata['underfoot.model_sha256'] } : {}),
        thresholds: config.thresholds,
        caution: SAFETY_CAUTION,
        table: 'annotated',
        georeference,
      },
    });
    if (!georeference) {
      warnings.push(
        `${config.out}: coordinates are floor-frame metres, not WGS 84 longitude/latitude: ${config.floor ? `the floor ${config.floor} has no "georeference"` : 'give --floor with a "georeference" for WGS 84'}`,
      );
    }
  } else if (!skipAnnotated) await writeTable(config.out, decoded.annotated);
  if (config.summary) await writeTable(config.summary, decoded.summary);
  return { decoded, warnings, nRuns: loaded.runs.length, nRows: decoded.annotated.nRows };
}
