/**
 * underfoot as a library. Entry points: build a model from a floor, score runs, decode a run, run one
 * EM iteration over many runs, or the whole multi-restart fit; read and write the files.
 */
export type { FloorGraph, FloorCell, FloorLink, Georeference } from './model/floor-graph.js';
export type { HmmModel, TransitionMode, TransitionStructure, ModelCell } from './model/hmm-model.js';
export { buildModel, type BuildModelOptions } from './model/build-model.js';
export { buildStructure } from './model/build-structure.js';
export { surveyPrior } from './model/survey-prior.js';
export { maximizeModel, type MaximizeOptions } from './model/maximize-model.js';
export { chainFromModel } from './model/chain-from-model.js';
export type { MovementParams } from './model/hmm-model.js';
export { sampleRun } from './model/sample-run.js';
export { SeededRandom } from './model/seeded-random.js';
export { analyzeFloor, type FloorAnalysis } from './model/analyze-floor.js';
export { checkModelFloor } from './model/check-model-floor.js';
export { withFloorZones } from './model/with-floor-zones.js';

export type { SparseChain } from './kernels/sparse-chain.js';
export { forwardScaled } from './kernels/forward-scaled.js';
export { backwardScaled } from './kernels/backward-scaled.js';
export { posteriorMarginals } from './kernels/posterior-marginals.js';
export { forwardScore } from './kernels/forward-score.js';
export { viterbiLog } from './kernels/viterbi-log.js';
export { expectedCounts } from './kernels/expected-counts.js';
export { positionSummary, positionWorkSize, type PositionGroups, type PositionPass, type PositionSteps } from './kernels/position-summary.js';

export { emIteration, type RunReadings, type EmIterationResult } from './fit/em-iteration.js';
export { fitModel, DEFAULT_FIT_OPTIONS, type FitInput, type FitResult, type FitProgress } from './fit/fit-model.js';
export type { FitOptions, FitRecord, LoopRecord, FitTransitions } from './fit/fit-record.js';
export { predictiveCalibration, type PredictiveCalibration, type ReliabilityBin } from './fit/predictive-calibration.js';
export { autoCandidates, shareRestarts } from './fit/auto-candidates.js';

export { decodeRun, type DecodedRun, type DecodeOptions } from './decode/decode-run.js';
// Eight runs decoded side by side, the same numbers as decodeRun (DEVELOPERS.md, "Decoding in lanes").
export { decodeLanes, type LaneDecodeOptions } from './decode/decode-lanes.js';
export { logLanes, type LaneTables } from './decode/log-lanes.js';
export { positionLayout, type PositionLayout } from './decode/position-layout.js';
// Wheel odometry (DEVELOPERS.md, "Movement"): a table's odometry columns, their bins, decoding with them.
export { runMovement, type RunOdometry, type TableMovement } from './io/run-movement.js';
export { moveStepsFromOdometry } from './model/move-steps-from-odometry.js';
export { decodeMoveRun } from './decode/decode-move-run.js';
export type { MoveSteps } from './kernels/move-chain.js';
export { scoreRun } from './decode/score-run.js';
export { logChain } from './decode/log-chain.js';

export { readFloor } from './io/read-floor.js';
export { parseFloor } from './io/parse-floor.js';
export { readRuns } from './io/read-runs.js';
export { runsFromCsv, runsFromArrow } from './io/parse-runs.js';
export { readModel } from './io/read-model.js';
export { parseModel } from './io/parse-model.js';
export { formatModel } from './io/format-model.js';
export { writeTable } from './io/write-table.js';
export type { RunsTable, RunSequence } from './io/runs-table.js';
export { InputError, WorkError } from './errors.js';
