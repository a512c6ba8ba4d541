import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { check } from '@placemarkio/check-geojson';
import { runCli, tempDir } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';
import { buildModel } from '../../src/model/build-model.js';
import { formatModel } from '../../src/io/format-model.js';
import { expectClose } from '../helpers/close.js';

// decode --out X.geojson: one Point feature per annotated row at its path cell. Checked with a
// general-purpose GeoJSON checker (@placemarkio/check-geojson, RFC 7946 structure) and, with a
// georeference, against a position worked out by hand.
// Cell g-2-1 alone reads carpet, so the run's carpet readings put its path there.
const floor = gridFloor(3, 2, ['oak', 'tile', 'carpet'], (x, y) => (x === 2 && y === 1 ? 2 : (x + 2 * y) % 2), 'geojson test floor');
const georeferenced = { ...floor, georeference: { lat: 45, lon: 10, bearing: 90 } };
const tmp = tempDir();
const p = tmp.path;

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor));
  writeFileSync(p('geo-floor.json'), JSON.stringify(georeferenced));
  writeFileSync(p('model.json'), formatModel({ name: 'geojson test', model: buildModel(floor, { hit: 0.95, dwell: 0.5 }), fit: null }));
  const lines = ['run,step,reading'];
  for (let t = 0; t < 12; t++) lines.push(`r1,${t},${t >= 8 ? 'carpet' : t % 3 === 0 ? 'tile' : 'oak'}`);
  lines.push('r2,0,oak', 'r2,1,', 'r2,2,tile');
  writeFileSync(p('runs.csv'), `${lines.join('\n')}\n`);
});
afterAll(() => tmp.remove());

interface Feature {
  type: 'Feature';
  geometry: { type: 'Point'; coordinates: [number, number] } | null;
  properties: Record<string, unknown>;
}

describe('decode --out X.geojson', () => {
  it('with a georeference: valid RFC 7946 points in WGS 84, a known cell at the hand-worked coordinate, every annotated column a property', () => {
    const r = runCli(['decode', '--model', p('model.json'), '--floor', p('geo-floor.json'), '--runs', p('runs.csv'), '--out', p('a.geojson'), '--summary', p('s.csv')]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).not.toContain('floor-frame');
    const text = readFileSync(p('a.geojson'), 'utf8');
    const parsed = check(text) as unknown as { type: string; features: Feature[]; underfoot: Record<string, unknown> };
    expect(parsed.type).toBe('FeatureCollection');
    expect(parsed.features).toHaveLength(15); // one per input row
    expect(parsed.underfoot.coordinates).toBe('WGS 84 longitude, latitude (degrees)');
    expect(parsed.underfoot.georeference).toEqual({ lat: 45, lon: 10, bearing: 90 });
    expect(String(parsed.underfoot.caution)).toContain('not a safety function');
    // Cell g-2-1 sits at x = 2.5, y = 1.5 m. Bearing 90 (x due east): east = 2.5 m, north = 1.5 m.
    // WGS 84 at φ = 45° (a = 6378137, e² = 0.00669437999014; NIMA TR8350.2):
    //   N·cos φ = 6378137/√(1 − e²/2) × cos45° = 6388838.2901 × 0.70710678 = 4517590.8788 m
    //   M = 6378137 × (1 − e²)/(1 − e²/2)^1.5 = 6367381.8156 m
    //   lon = 10 + (2.5 / 4517590.8788) × 180/π = 10 + 3.1707043e-5 = 10.0000317070°
    //   lat = 45 + (1.5 / 6367381.8156) × 180/π = 45 + 1.3497527e-5 = 45.0000134975°
    // (local tangent-plane approximation, as docs/formats.md says; coordinates written to 8 decimals)
    const atCell = parsed.features.find((f) => f.properties.path_cell === 'g-2-1');
    expect(atCell, 'some row on cell g-2-1').toBeDefined();
    const [lon, lat] = atCell!.geometry!.coordinates;
    expectClose(lon, 10.000031707, { abs: 6e-9 }, 'lon');
    expectClose(lat, 45.0000134975, { abs: 6e-9 }, 'lat');
    // properties: the annotated columns, in order, with their values
    const csv = runCli(['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', p('a.csv'), '-q']);
    expect(csv.code, csv.stderr).toBe(0);
    const header = readFileSync(p('a.csv'), 'utf8').split('\n')[0].split(',');
    expect(Object.keys(parsed.features[0].properties)).toEqual(header);
    const first = parsed.features[0].properties;
    expect(first.run).toBe('r1');
    expect(first.step).toBe(0);
    expect(typeof first.path_p).toBe('number');
    expect(first.flag_dropout).toBe(false);
    expect(parsed.features[13].properties.flag_dropout).toBe(true);
  });

  it('without a georeference: floor-frame metres, said in the file and in a warning', () => {
    const r = runCli(['decode', '--model', p('model.json'), '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('b.geojson')]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toContain('b.geojson: coordinates are floor-frame metres, not WGS 84 longitude/latitude');
    const parsed = check(readFileSync(p('b.geojson'), 'utf8')) as unknown as { features: Feature[]; underfoot: Record<string, unknown> };
    expect(parsed.underfoot.coordinates).toBe('floor-frame metres x, y (not WGS 84: the floor has no georeference)');
    expect(parsed.underfoot.georeference).toBe(null);
    for (const f of parsed.features) {
      expect(f.geometry!.coordinates).toEqual([f.properties.path_x, f.properties.path_y]);
    }
  });

  it('refuses --compression and a GeoJSON run summary', () => {
    const c = runCli(['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', p('c.geojson'), '--compression', 'zstd']);
    expect(c.code).toBe(2);
    expect(c.stderr).toContain('c.geojson: --compression must go with an Arrow (.arrow, .feather, .arrows) or Parquet output, got a GeoJSON output');
    const s = runCli(['decode', '--model', p('model.json'), '--runs', p('runs.csv'), '--out', p('d.csv'), '--summary', p('s.geojson')]);
    expect(s.code).toBe(2);
    expect(s.stderr).toContain('s.geojson: extension must be one of');
  });
});
