/**
 * Printed with every decode: results must say plainly what they are not. The same words are stored in
 * the annotated table's metadata (`SAFETY_CAUTION`, `pipeline/decode-from-files.ts`): one text, two places.
 */
export { SAFETY_CAUTION as SAFETY_NOTE } from '../pipeline/cli-surface.js';
