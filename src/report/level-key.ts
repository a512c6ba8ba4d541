/** A level number as an id fragment (`m2` for level −2), so every map's internal ids are unique. */
export function levelKey(level: number): string {
  return level < 0 ? `m${-level}` : String(level);
}
