import { describe, it, expect } from 'vitest';
import { floorToWgs84 } from '../../src/model/floor-to-wgs84.js';
import { expectClose } from '../helpers/close.js';

// Hand-worked local tangent-plane (equirectangular) approximation on the WGS 84 ellipsoid.
// Source of the constants: NIMA TR8350.2 (3rd ed.), a = 6378137 m, 1/f = 298.257223563, so
// e² = f(2 − f) = 0.00669437999014. Radii of curvature at latitude φ: meridian M = a(1 − e²)/(1 − e² sin²φ)^1.5,
// prime vertical N = a/√(1 − e² sin²φ) (standard geodesy; TR8350.2 section 4).
// At φ = 45°: 1 − e²·sin²45° = 1 − 0.00669437999014 × 0.5 = 0.99665281000493
//   N = 6378137 / √0.99665281000493 = 6388838.2901 m;   N·cos45° = 4517590.8788 m
//   M = 6378137 × 0.99330562000986 / 0.99665281000493^1.5 = 6367381.8156 m
const DEG = 180 / Math.PI;

describe('floorToWgs84(georeference, x, y)', () => {
  it('x axis due east (bearing 90): 100 m along x moves the longitude by 100/(N cos φ) radians and not the latitude', () => {
    // Δlon = 100 / 4517590.8788 rad = 2.213569e-5 rad = 0.00126828172°
    const [lon, lat] = floorToWgs84({ lat: 45, lon: 10, bearing: 90 }, 100, 0);
    expectClose(lon, 10 + 0.0012682817247, { abs: 1e-12 }, 'lon');
    expectClose(lat, 45, { abs: 1e-12 }, 'lat');
  });

  it('bearing 30: (3, 4) m lies 1.9641 m west and 4.5981 m north of the origin', () => {
    // east  = x sin30° − y cos30° = 3 × 0.5 − 4 × 0.8660254 = −1.9641016 m
    // north = x cos30° + y sin30° = 3 × 0.8660254 + 4 × 0.5 = 4.5980762 m
    // Δlat = 4.5980762 / 6367381.8156 rad = 7.22129e-7 rad = 4.137499e-5°
    // Δlon = −1.9641016 / 4517590.8788 rad = −4.34768e-7 rad = −2.491034e-5°
    const [lon, lat] = floorToWgs84({ lat: 45, lon: 10, bearing: 30 }, 3, 4);
    expectClose(lat, 45.00004137499, { abs: 1e-11 }, 'lat');
    expectClose(lon, 9.99997508966, { abs: 1e-11 }, 'lon');
  });

  it('one metre north at 45° is 1/111131.78 of a degree of latitude, the length of a degree of latitude there', () => {
    // Length of a degree of latitude on WGS 84: 111132.954 − 559.822 cos 2φ + 1.175 cos 4φ metres (series
    // from memory); at φ = 45°: 111132.954 − 0 − 1.175 = 111131.779 m.
    const [, lat] = floorToWgs84({ lat: 45, lon: 0, bearing: 0 }, 1, 0);
    expectClose(1 / (lat - 45), 111131.779, { abs: 0.01 }, 'metres per degree');
  });

  it('y is x turned 90° counter-clockwise (bearing 0: +x north, +y west), and the origin maps to itself', () => {
    const g = { lat: -33.9, lon: 151.2, bearing: 0 };
    expect(floorToWgs84(g, 0, 0)).toEqual([151.2, -33.9]);
    const [lonY, latY] = floorToWgs84(g, 0, 10);
    expect(lonY).toBeLessThan(151.2);
    expectClose(latY, -33.9, { abs: 1e-12 }, 'lat unchanged');
    // distances are kept: 10 m west at φ = −33.9° is 10/(N cos φ) radians of longitude
    const phi = -33.9 / DEG;
    const n = 6378137 / Math.sqrt(1 - 0.00669437999014 * Math.sin(phi) ** 2);
    expectClose((151.2 - lonY) / DEG, 10 / (n * Math.cos(phi)), { rel: 1e-9 }, 'Δlon');
  });

  it('wraps longitudes across the antimeridian into [−180, 180]', () => {
    const [lon] = floorToWgs84({ lat: 0, lon: 179.99999, bearing: 90 }, 10, 0);
    expect(lon).toBeLessThan(-179.9999);
    expect(lon).toBeGreaterThanOrEqual(-180);
  });
});
