import type { Georeference } from './floor-graph.js';

/** WGS 84 ellipsoid: semi-major axis (m) and flattening. Source: NIMA TR8350.2, 3rd ed., table 3.1. */
const WGS84_A = 6378137;
const WGS84_F = 1 / 298.257223563;
const WGS84_E2 = WGS84_F * (2 - WGS84_F);
const DEG = Math.PI / 180;

/**
 * Floor-frame metres → WGS 84 longitude and latitude (degrees), by a local tangent-plane
 * (equirectangular) APPROXIMATION about the georeference origin:
 *
 *   east  = x·sin β − y·cos β,   north = x·cos β + y·sin β      (β = bearing of +x, clockwise from north;
 *                                                                 +y is +x turned 90° counter-clockwise)
 *   lat = lat₀ + north / M(lat₀),   lon = lon₀ + east / (N(lat₀)·cos lat₀)   (radians)
 *
 * with M = a(1 − e²)/(1 − e² sin² lat₀)^{3/2} the meridian radius of curvature and N = a/√(1 − e²
 * sin² lat₀) the prime-vertical radius of the WGS 84 ellipsoid (any geodesy text, e.g. NIMA TR8350.2,
 * section 4). The error grows with the square of the distance from the origin: a few millimetres within
 * 100 m, some centimetres at 1 km — fine for a building, not for a site kilometres across. Longitudes
 * are wrapped into [−180, 180]. Returns `[lon, lat]` (GeoJSON order, RFC 7946 section 3.1.1).
 */
export function floorToWgs84(georef: Georeference, x: number, y: number): [number, number] {
  const beta = georef.bearing * DEG;
  const east = x * Math.sin(beta) - y * Math.cos(beta);
  const north = x * Math.cos(beta) + y * Math.sin(beta);
  const phi = georef.lat * DEG;
  const s2 = Math.sin(phi) ** 2;
  const m = (WGS84_A * (1 - WGS84_E2)) / (1 - WGS84_E2 * s2) ** 1.5;
  const n = WGS84_A / Math.sqrt(1 - WGS84_E2 * s2);
  const lat = georef.lat + north / m / DEG;
  let lon = georef.lon + east / (n * Math.cos(phi)) / DEG;
  if (lon > 180) lon -= 360;
  if (lon < -180) lon += 360;
  return [lon, lat];
}
