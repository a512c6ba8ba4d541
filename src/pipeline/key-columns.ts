/** The runs table's key columns and the treatment of unknown readings (`--run-col` etc.). */
export interface KeyColumns {
  runCol: string;
  stepCol: string;
  readingCol: string;
  unknownReadings: 'error' | 'dropout';
  /** Odometry columns (`--moved-col`, `--heading-col`); absent = the default names, used when present. */
  movedCol?: string;
  headingCol?: string;
  /** A time column mapped to steps (`--time-col`) and its period in seconds (`--period`; inferred when absent). */
  timeCol?: string;
  period?: number;
}

export const DEFAULT_KEY_COLUMNS: KeyColumns = { runCol: 'run', stepCol: 'step', readingCol: 'reading', unknownReadings: 'error' };
