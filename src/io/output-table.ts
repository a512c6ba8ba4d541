/**
 * A table to write (annotated table, run summary): columns read row by row through `get`, so callers
 * can present typed arrays or input columns without copying them into row objects.
 */
import type { DataType } from 'apache-arrow';

export interface OutputColumn {
  name: string;
  /**
   * How to store the column in Arrow: `utf8` text, `float64`, `int32`, `int64` (values are numbers up to
   * 2^53 or bigints), `dictionary` (text stored dictionary-encoded: Arrow Dictionary<Utf8, Int32>, Parquet
   * RLE_DICTIONARY pages), or `passthrough` (an input column carried through: its `arrowType` when given
   * and simple, else a type that fits the values; see `tableToArrowBytes`). In CSV every kind is written
   * as text.
   */
  kind: 'utf8' | 'float64' | 'int32' | 'int64' | 'dictionary' | 'passthrough';
  /** Value at `row`; `null` for a missing value (an empty CSV field, an Arrow null). */
  get(row: number): string | number | bigint | boolean | null;
  /** For `passthrough`: the Arrow type the column was read with (`InputColumn.arrowType`), if any. */
  arrowType?: DataType;
  /**
   * For `dictionary`: a fixed dictionary (e.g. the model's cell ids, so every file of one model shares
   * it) with `code(row)` its index for the row (−1 = null). Without them the writer builds the dictionary
   * from the values, in order of first appearance.
   */
  dictionary?: readonly string[];
  code?(row: number): number;
}

export interface OutputTable {
  nRows: number;
  columns: OutputColumn[];
  /** Key-value metadata stored in Arrow and Parquet schemas (CSV has none). */
  metadata?: Record<string, string>;
}
