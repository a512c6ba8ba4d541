import { InputError, quote } from '../errors.js';
import type { Cell, NamedColumns } from '../io/columns-from-bytes.js';

/** The column `name` of a table that must have it (`what` names the table in the message). */
export function requiredColumn(table: NamedColumns, name: string, what: string): (row: number) => Cell {
  const column = table.column(name);
  if (!column) throw new InputError(`${table.source}: the ${what} must have a ${quote(name)} column, got columns ${quote(table.names.join(', '))}`);
  return column;
}
