/**
 * The table options the CLI passes on (`--format` for `-`, `--compression`, `--period`), so the CLI depends on the
 * pipeline only (io stays below it).
 */
export { setStdioTableFormat } from '../io/table-format-of.js';
export { setTableCompression } from '../io/table-compression.js';
export { parsePeriod } from '../io/parse-time.js';
