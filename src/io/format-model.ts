import { formatJson } from './format-json.js';
import { MODEL_FORMAT, type ModelFile } from './model-file.js';

/**
 * The text of an `underfoot-model/1` file. Layout: `surfaces`; `cells` (id, nominal surface, position,
 * start and dwell probabilities); `links` (every non-dwell transition of the floor graph with its
 * probability, in the model's CSR order); `emission` (one row per cell in cell order, one column per
 * surface); `fit` (provenance, or null). Reading the text and formatting it again gives the same bytes.
 */
export function formatModel(file: ModelFile): string {
  const { model } = file;
  const s = model.structure;
  const m = model.surfaces.length;
  const cells = model.cells.map((c, i) => ({
    id: c.id,
    surface: c.surface,
    x: c.x,
    y: c.y,
    level: c.level,
    ...(c.zone !== undefined ? { zone: c.zone } : {}),
    start: model.start[i],
    dwell: model.trans[s.dwellPos[i]],
  }));
  const links: Array<{ from: string; to: string; p: number }> = [];
  for (let i = 0; i < s.nCells; i++) {
    for (let k = s.succPtr[i]; k < s.succPtr[i + 1]; k++) {
      if (k !== s.dwellPos[i]) links.push({ from: model.cells[i].id, to: model.cells[s.succIdx[k]].id, p: model.trans[k] });
    }
  }
  const emission = model.cells.map((_, i) => Array.from(model.emission.subarray(i * m, (i + 1) * m)));
  return (
    `${formatJson({
      format: MODEL_FORMAT,
      name: file.name,
      surfaces: model.surfaces,
      cells,
      links,
      emission,
      ...(model.movement ? { movement: { stayLogit: model.movement.stayLogit, stayPerMetre: model.movement.stayPerMetre, kappa: model.movement.kappa } } : {}),
      fit: file.fit,
    })}\n`
  );
}
