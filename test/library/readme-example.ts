// The README's library example ("Using it from code"), run by test/library/package-entry.test.ts through
// the package entry ('underfoot', package.json "exports"). Arguments: floor, runs table, output folder.
import { readFloor, readRuns, fitModel, DEFAULT_FIT_OPTIONS, decodeRuns, DEFAULT_THRESHOLDS, writeTable, type HmmModel } from 'underfoot';

const [floorPath, runsPath, outDir] = process.argv.slice(2);
const floor = await readFloor(floorPath);
const runs = await readRuns(runsPath, { surfaces: floor.surfaces });
const { model }: { model: HmmModel } = await fitModel(
  { floor, runs: runs.runs, floorDigest: '', runsDigests: [] },
  { ...DEFAULT_FIT_OPTIONS, restarts: 2 },
  1, // worker threads
);
const { annotated, summary } = decodeRuns(model, [runs], DEFAULT_THRESHOLDS, () => 'fit');
await writeTable(`${outDir}/annotated.arrow`, annotated, { compression: 'zstd' });
await writeTable(`${outDir}/summary.csv`, summary);
console.log(`${annotated.nRows} rows decoded`);
