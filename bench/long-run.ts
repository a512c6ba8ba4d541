/**
 * One long run through the E-step and decoding, to check that memory stays flat in run length:
 *
 *     npm run build && node dist/bench/long-run.js [steps] [size]
 *
 * Draws one run of `steps` steps (default 1 000 000) from the truth model of the `size` scenario
 * (default medium: 400 cells), then times (a) its contribution to an E-step, as `fit` computes it
 * (`accumulateBlock`, tied transitions), and (b) `decodeRun`, printing wall seconds and the process's
 * peak resident set size after each. Runs of this length are processed as checkpointed forward-backward
 * (forward vectors kept every ⌈√T⌉ steps) and checkpointed Viterbi; the limit is 500 MB.
 */
import { makeScenario, type ScenarioSize } from './make-scenario.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { sampleRun } from '../src/model/sample-run.js';
import { SeededRandom } from '../src/model/seeded-random.js';
import { accumulateBlock } from '../src/fit/accumulate-block.js';
import { EStepWorkspace } from '../src/fit/e-step-workspace.js';
import { packRuns } from '../src/fit/packed-runs.js';
import { decodeRun } from '../src/decode/decode-run.js';
import { logChain } from '../src/decode/log-chain.js';

const steps = Number(process.argv[2] ?? 1_000_000);
const size = (process.argv[3] ?? 'medium') as ScenarioSize;
if (!(Number.isInteger(steps) && steps > 0)) {
  process.stderr.write(`long-run: steps must be a positive integer, got ${JSON.stringify(process.argv[2])}\n`);
  process.exit(2);
}
const rss = (): string => `${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`;
const scenario = makeScenario(size, 1);
const chain = chainFromModel(scenario.truth);
const run = sampleRun(scenario.truth, steps, new SeededRandom(3), 0.02);
console.log(`${size} building: ${chain.nCells} cells, ${chain.nnz} nonzeros; one run of ${steps} steps; peak RSS after drawing it: ${rss()}`);

let t0 = process.hrtime.bigint();
const packed = packRuns([{ id: 'long', obs: run.obs }]);
const block = accumulateBlock(chain, packed, [0], new EStepWorkspace(), 'tied');
let seconds = Number(process.hrtime.bigint() - t0) / 1e9;
console.log(`E-step (tied):   ${seconds.toFixed(1)} s, ${((seconds * 1e9) / (steps * chain.nnz)).toFixed(2)} ns/step-link, log-likelihood/reading ${(block.counts.logLik / block.counts.nReadings).toFixed(4)}; peak RSS ${rss()}`);

t0 = process.hrtime.bigint();
const decoded = decodeRun(chain, logChain(chain), run.obs);
seconds = Number(process.hrtime.bigint() - t0) / 1e9;
let hits = 0;
for (let t = 0; t < steps; t++) if (decoded.path[t] === run.cells[t]) hits++;
console.log(`decodeRun:       ${seconds.toFixed(1)} s, ${((seconds * 1e9) / (steps * chain.nnz)).toFixed(2)} ns/step-link, path = true cell ${((100 * hits) / steps).toFixed(1)}%; peak RSS ${rss()}`);
