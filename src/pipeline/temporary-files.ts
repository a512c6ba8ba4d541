/**
 * The clean-up of temporary output files on exit, for the CLI's signal handlers. Its own file (not
 * `cli-surface.ts`, which also names decode, compare and report defaults) so that installing the
 * handlers at start-up loads only the writer's module.
 */
export { removeTemporaryFiles } from '../io/write-atomic.js';
