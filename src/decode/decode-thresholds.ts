/** When a decoded step is flagged (docs/formats.md, "Annotated table", `flag`). */
export interface DecodeThresholds {
  /** A step whose path cell has posterior below this is `low-confidence`. @default 0.5 */
  lowConfidence: number;
  /** A reading with surprise above this many bits is `surprising`. @default 6 */
  surprisingBits: number;
}

export const DEFAULT_THRESHOLDS: DecodeThresholds = { lowConfidence: 0.5, surprisingBits: 6 };
