import type { FloorGraph } from './floor-graph.js';
import type { HmmModel } from './hmm-model.js';

/**
 * The model with each cell's zone taken from the floor (cells matched by position; the caller has
 * checked with `checkModelFloor` that they are the same cells). Zones are labels, not parameters: when
 * a floor is given beside a model (`decode --floor`, `report --floor`, `fit --from`, `compare`), the
 * floor's zones win, so zones can be redrawn without re-fitting. A cell the floor leaves without a zone
 * has none. Returns the same object when nothing changes.
 */
export function withFloorZones(model: HmmModel, floor: FloorGraph): HmmModel {
  const same = model.cells.every((c, i) => c.zone === floor.cells[i].zone);
  if (same) return model;
  const cells = model.cells.map((c, i) => {
    const { zone: _old, ...rest } = c;
    const zone = floor.cells[i].zone;
    return zone === undefined ? rest : { ...rest, zone };
  });
  return { ...model, cells };
}
