import { InputError, quote } from '../errors.js';
import type { InputColumn, RunsTable } from '../io/runs-table.js';

/** A column of an annotated table by name; an InputError naming the file when it is missing. */
export function annotatedColumn(table: RunsTable, name: string): InputColumn {
  const column = table.columns.find((c) => c.name === name);
  if (!column) {
    throw new InputError(`${table.source}: the annotated table must have a ${quote(name)} column (as decode writes it), got columns ${quote(table.columns.map((c) => c.name).join(', '))}`);
  }
  return column;
}

