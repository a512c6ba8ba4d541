/**
 * The surveyed floor graph, as read from an `underfoot-floor/1` file (see CONTRACT.md).
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
}
