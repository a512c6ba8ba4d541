// The README's library example from plain JavaScript (same steps as readme-example.ts).
import { readFloor, readRuns, fitModel, DEFAULT_FIT_OPTIONS, decodeRuns, DEFAULT_THRESHOLDS, writeTable } from 'underfoot';

const [floorPath, runsPath, outDir] = process.argv.slice(2);
const floor = await readFloor(floorPath);
const runs = await readRuns(runsPath, { surfaces: floor.surfaces });
const { model } = await fitModel(
  { floor, runs: runs.runs, floorDigest: '', runsDigests: [] },
  { ...DEFAULT_FIT_OPTIONS, restarts: 2 },
  1, // worker threads
);
const { annotated, summary } = decodeRuns(model, [runs], DEFAULT_THRESHOLDS, () => 'fit');
await writeTable(`${outDir}/annotated.arrow`, annotated, { compression: 'zstd' });
await writeTable(`${outDir}/summary.csv`, summary);
console.log(`${annotated.nRows} rows decoded`);
