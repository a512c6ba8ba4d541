// The fit record's types live in src/model (the model file, read by src/io, carries them).
export type { StopReason, LoopRecord, FitOptions, FitRecord, FitTransitions, PredictiveCalibration, ReliabilityBin } from '../model/fit-record.js';
