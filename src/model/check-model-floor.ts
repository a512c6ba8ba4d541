import { InputError, quote } from '../errors.js';
import type { FloorGraph } from './floor-graph.js';
import type { HmmModel } from './hmm-model.js';
import { buildModel } from './build-model.js';

/**
 * Checks that a model was made for this floor: the same reading alphabet in the same order, the same cells
 * in the same order, and the same links. One line naming both files and the first difference.
 */
export function checkModelFloor(model: HmmModel, modelSource: string, floor: FloorGraph, floorSource: string): void {
  const fail = (what: string): never => {
    throw new InputError(`${modelSource}: the model must match the floor ${floorSource}, but ${what}`);
  };
  if (model.surfaces.join('\u0000') !== floor.surfaces.join('\u0000')) {
    fail(`its surfaces are ${quote(model.surfaces.join(', '))} and the floor's are ${quote(floor.surfaces.join(', '))}`);
  }
  if (model.cells.length !== floor.cells.length) fail(`it has ${model.cells.length} cells and the floor ${floor.cells.length}`);
  model.cells.forEach((c, i) => {
    if (c.id !== floor.cells[i].id) fail(`cell ${i + 1} is ${quote(c.id)} in the model and ${quote(floor.cells[i].id)} in the floor`);
  });
  const expected = buildModel(floor).structure;
  const s = model.structure;
  for (let i = 0; i < s.nCells; i++) {
    const a = Array.from(s.succIdx.subarray(s.succPtr[i], s.succPtr[i + 1])).join(',');
    const b = Array.from(expected.succIdx.subarray(expected.succPtr[i], expected.succPtr[i + 1])).join(',');
    if (a !== b) fail(`cell ${quote(model.cells[i].id)} has different links (model: ${a.split(',').map((j) => model.cells[+j].id).join(' ')}; floor: ${b.split(',').map((j) => model.cells[+j].id).join(' ')})`);
  }
}
