/**
 * The table options the CLI passes on (`--format` for `-`, `--period`), so the CLI depends on the
 * pipeline only (io stays below it).
 */
export { setStdioTableFormat } from '../io/table-format-of.js';
export { parsePeriod } from '../io/parse-time.js';
