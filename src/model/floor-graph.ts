/**
 * The surveyed floor graph, as read from an `underfoot-floor/1` file (see docs/formats.md, "Floor file").
 * Plain data: the reader in `src/io/` validates it; `src/model/` builds models from it.
 */
export interface FloorCell {
  id: string;
  /** Surveyed surface; always one of `FloorGraph.surfaces`. */
  surface: string;
  /** Metres. */
  x: number;
  /** Metres. */
  y: number;
  /** Integer level; 0 when the file leaves it out. */
  level: number;
  /** True when runs may begin in this cell. */
  start: boolean;
  /** Named area (room, corridor, lift) the cell belongs to; absent when the file gives none. */
  zone?: string;
}

/**
 * Where the floor's x/y frame sits on the Earth: the origin in WGS 84 degrees and the bearing of the
 * x axis in degrees clockwise from north. Kept with the floor; `decode` uses it for GeoJSON output (`floorToWgs84`).
 */
export interface Georeference {
  lat: number;
  lon: number;
  bearing: number;
}

export interface FloorLink {
  from: string;
  to: string;
  /** One-way links allow only `from → to`; others are two-way. */
  oneway: boolean;
}

export interface FloorGraph {
  format: 'underfoot-floor/1';
  name: string;
  /** The reading alphabet, in the file's order. */
  surfaces: string[];
  cells: FloorCell[];
  links: FloorLink[];
  /** Optional; absent when the file gives none. */
  georeference?: Georeference;
}
