import { InputError, WorkError, quote } from '../errors.js';
import type { OutputTable } from './output-table.js';

/**
 * Checks a table before it is written: a whole number of rows and one non-empty, unique name per column
 * (a repeated name, e.g. an input column already called `path_cell`, would make the file ambiguous).
 */
export function checkOutputTable(table: OutputTable, where: string): void {
  if (!Number.isSafeInteger(table.nRows) || table.nRows < 0) {
    throw new WorkError(`${where}: row count must be a whole number >= 0, got ${quote(table.nRows)}`);
  }
  const firstAt = new Map<string, number>();
  table.columns.forEach((column, i) => {
    if (column.name === '') throw new WorkError(`${where}: column ${i + 1} must have a name, got an empty name`);
    const first = firstAt.get(column.name);
    if (first !== undefined) {
      throw new InputError(
        `${where}: column ${i + 1} must have a unique name, got ${quote(column.name)} again (also column ${first + 1})`,
      );
    }
    firstAt.set(column.name, i);
  });
}
