/**
 * Decoding one run at a time against decoding in lanes of eight, on a scenario (default medium):
 *
 *     npm run build && node dist/bench/decode-lanes.js [runs] [repeats] [size]
 *
 * Times, over the first `runs` runs (default 48, a multiple of 8) of the scenario, `repeats` passes each
 * (default 5; the fastest and the median are printed, wall clock and process CPU time, in ns per step-link = total steps × transition
 * nonzeros): the Viterbi path (`viterbiPath` per run, against `decodeLanes` with `viterbiOnly`) and the
 * full decode with every annotated column (`decodeRun` with positions per run, against `decodeLanes`),
 * the lanes in WebAssembly SIMD and in JavaScript. Every pass's outputs are checked to be the same bit
 * for bit as the one-run decoder's (the row says "same" or the first difference). One thread.
 */
import { makeScenario, SCENARIO_SIZES, type ScenarioSize } from './make-scenario.js';
import { chainFromModel } from '../src/model/chain-from-model.js';
import { logChain } from '../src/decode/log-chain.js';
import { decodeRun, type DecodedRun } from '../src/decode/decode-run.js';
import { viterbiPath } from '../src/decode/viterbi-path.js';
import { decodeLanes } from '../src/decode/decode-lanes.js';
import { logLanes } from '../src/decode/log-lanes.js';
import { positionLayout } from '../src/decode/position-layout.js';
import { WasmDecodeLanes } from '../src/kernels/wasm-decode-lanes.js';
import { LANES } from '../src/kernels/sparse-chain.js';

const nRuns = Number(process.argv[2] ?? 48);
const repeats = Number(process.argv[3] ?? 5);
const size = (process.argv[4] ?? 'medium') as ScenarioSize;
if (!(Number.isInteger(nRuns) && nRuns > 0 && nRuns % LANES === 0) || !(Number.isInteger(repeats) && repeats > 0) || !(size in SCENARIO_SIZES)) {
  process.stderr.write(`decode-lanes: usage: node dist/bench/decode-lanes.js [runs: a positive multiple of ${LANES}] [repeats] [size], got ${JSON.stringify(process.argv.slice(2))}\n`);
  process.exit(2);
}
const sc = makeScenario(size, 1);
const chain = chainFromModel(sc.truth);
const log = logChain(chain);
const lanes = logLanes(chain, log);
const positions = positionLayout(sc.truth).groups;
const runs = sc.runs.slice(0, nRuns).map((r) => r.obs);
const stepLinks = runs.reduce((s, r) => s + r.length, 0) * chain.nnz;
const limit = 64 * 1024 * 1024;

function differs(a: DecodedRun, b: DecodedRun, full: boolean): string | null {
  const arrays: Array<[string, ArrayLike<number>, ArrayLike<number>]> = [['path', a.path, b.path]];
  if (full) {
    arrays.push(['pathP', a.pathP, b.pathP], ['likelyCell', a.likelyCell, b.likelyCell], ['likelyP', a.likelyP, b.likelyP]);
    arrays.push(['entropy', a.entropyBits, b.entropyBits], ['surprise', a.surpriseBits, b.surpriseBits]);
    for (const key of ['likelyZone', 'zoneP', 'meanLevel', 'meanX', 'meanY', 'spreadM'] as const) arrays.push([key, a.positions![key], b.positions![key]]);
    if (!Object.is(a.logLik, b.logLik)) return 'logLik';
  }
  if (!Object.is(a.pathLogProb, b.pathLogProb)) return 'pathLogProb';
  for (const [name, x, y] of arrays) for (let t = 0; t < y.length; t++) if (!Object.is(x[t], y[t])) return `${name}[${t}]`;
  return null;
}

function viterbiOne(obs: Int32Array): DecodedRun {
  const path = new Int32Array(obs.length);
  const pathLogProb = viterbiPath(chain, log, obs, limit, path);
  return { path, pathLogProb } as DecodedRun;
}

type Pass = () => DecodedRun[];
function inGroups(decode: (group: Int32Array[]) => DecodedRun[]): Pass {
  return () => {
    const out: DecodedRun[] = [];
    for (let r = 0; r < runs.length; r += LANES) out.push(...decode(runs.slice(r, r + LANES)));
    return out;
  };
}

const wasm = WasmDecodeLanes.available();
const reference = { viterbi: runs.map(viterbiOne), full: runs.map((obs) => decodeRun(chain, log, obs, { positions })) };
const rows: Array<[string, boolean, Pass]> = [
  ['Viterbi, one run at a time (viterbiPath)', false, () => runs.map(viterbiOne)],
  ...(wasm ? [['Viterbi, lanes, WebAssembly SIMD', false, inGroups((g) => decodeLanes(chain, lanes, g, { viterbiOnly: true }))] as [string, boolean, Pass]] : []),
  ['Viterbi, lanes, JavaScript', false, inGroups((g) => decodeLanes(chain, lanes, g, { viterbiOnly: true, useWasm: false }))],
  ['full decode, one run at a time (decodeRun)', true, () => runs.map((obs) => decodeRun(chain, log, obs, { positions }))],
  ...(wasm ? [['full decode, lanes, WebAssembly SIMD', true, inGroups((g) => decodeLanes(chain, lanes, g, { positions }))] as [string, boolean, Pass]] : []),
  ['full decode, lanes, JavaScript', true, inGroups((g) => decodeLanes(chain, lanes, g, { positions, useWasm: false }))],
];

console.log(`decode-lanes: ${size} scenario, ${chain.nCells} cells, ${chain.nnz} transition nonzeros, ${runs.length} runs x ${runs[0].length} steps, ${repeats} passes; Node ${process.version}`);
console.log('ns/step-link = seconds x 1e9 / (total steps x nonzeros), wall clock and process CPU time (the latter less disturbed by other work on a busy machine);');
console.log('fastest and median of the passes; "check" compares every output with the one-run decoder, bit for bit');
console.log(['operation', 'wall fastest', 'wall median', 'cpu fastest', 'cpu median', 'check'].join('\t'));
for (const [name, full, pass] of rows) {
  pass(); // warm-up
  const times: number[] = [];
  const cpu: number[] = [];
  let check = 'same';
  for (let r = 0; r < repeats; r++) {
    const c0 = process.cpuUsage();
    const t0 = process.hrtime.bigint();
    const got = pass();
    times.push(Number(process.hrtime.bigint() - t0));
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) * 1000);
    const want = full ? reference.full : reference.viterbi;
    for (let k = 0; k < runs.length && check === 'same'; k++) {
      const d = differs(got[k], want[k], full);
      if (d !== null) check = `run ${k}: ${d} differs`;
    }
  }
  times.sort((a, b) => a - b);
  cpu.sort((a, b) => a - b);
  const ns = (t: number): string => (t / stepLinks).toFixed(2);
  console.log([name, ns(times[0]), ns(times[Math.floor(times.length / 2)]), ns(cpu[0]), ns(cpu[Math.floor(cpu.length / 2)]), check].join('\t'));
}
