/** The runs table's key columns and the treatment of unknown readings (`--run-col` etc.). */
export interface KeyColumns {
  runCol: string;
  stepCol: string;
  readingCol: string;
  unknownReadings: 'error' | 'dropout';
}

export const DEFAULT_KEY_COLUMNS: KeyColumns = { runCol: 'run', stepCol: 'step', readingCol: 'reading', unknownReadings: 'error' };
