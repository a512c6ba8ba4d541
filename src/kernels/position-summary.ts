/**
 * How cells group into areas (zones) and levels, for `positionSummary`. Areas are numbered
 * 0 … nZones−1 (a caller may give every cell without a zone an area of its own); levels are numbered
 * 0 … nLevels−1. Coordinates are stored relative to an origin per level (`originX`, `originY`, e.g. the
 * level's centroid), so the second moments lose no precision to large survey coordinates.
 */
export interface PositionGroups {
  nZones: number;
  /** Area of each cell, in [0, nZones). */
  zoneOf: Int32Array;
  nLevels: number;
  /** Level index of each cell, in [0, nLevels). */
  levelOf: Int32Array;
  /** Cell x minus its level's `originX`, metres. */
  dx: Float64Array;
  /** Cell y minus its level's `originY`, metres. */
  dy: Float64Array;
  originX: Float64Array;
  originY: Float64Array;
}

/** Per-step outputs of `positionSummary`, one entry per step of the run. */
export interface PositionSteps {
  /** Area with the largest posterior mass (lowest index on ties). */
  likelyZone: Int32Array;
  /** Its posterior mass, Σ γ_t(i) over the area's cells. */
  zoneP: Float64Array;
  /** Level index with the largest posterior mass (lowest index on ties). */
  meanLevel: Int32Array;
  /** Posterior-mean position on that level (γ restricted to the level and renormalised), metres. */
  meanX: Float64Array;
  meanY: Float64Array;
  /** Root-mean-square distance of that restricted posterior from its mean, metres. */
  spreadM: Float64Array;
}

/** Scratch for one decode: the step's posterior over cells, and the sums `positionSummary` accumulates. */
export interface PositionPass {
  groups: PositionGroups;
  /** nCells: γ_t, written by the caller before each call. */
  gamma: Float64Array;
  /** nZones + 4 · nLevels: on return, the area sums, then per level [mass, Σγ·dx, Σγ·dy, Σγ·(dx² + dy²)]. */
  work: Float64Array;
  out: PositionSteps;
}

/** Work size for `PositionPass.work`. */
export function positionWorkSize(groups: PositionGroups): number {
  return groups.nZones + 4 * groups.nLevels;
}

/**
 * Area and position summaries of the posterior over cells at step t, one pass over the cells (O(cells)):
 * the mass of every area, P(area) = Σ_{i in area} γ_t(i), and per level ℓ the zeroth, first and second
 * moments M_ℓ = Σ γ, S_ℓ = Σ γ·(dx, dy), Q_ℓ = Σ γ·(dx² + dy²) over the level's cells. On the level of
 * largest mass the mean is S/M and the spread √(Q/M − |S/M|²) (clamped at 0 against rounding), the
 * root-mean-square distance of the renormalised posterior from its mean. Writes entry t of `pass.out`.
 * γ is used as given (the forward-backward posterior sums to 1 up to rounding). No allocation.
 */
export function positionSummary(nCells: number, pass: PositionPass, t: number): void {
  summarisePosition(nCells, pass.groups, pass.gamma, 1, 0, pass.work, pass.out, t);
}

/**
 * `positionSummary` over a posterior stored with a stride: γ(i) = gamma[stride · i + offset] (stride 8
 * and offset k for lane k of the decode lanes' nCells × 8 table). Writes entry `at` of `out`. The same
 * arithmetic in the same order whatever the stride.
 */
export function summarisePosition(
  nCells: number,
  groups: PositionGroups,
  gamma: Float64Array,
  stride: number,
  offset: number,
  work: Float64Array,
  out: PositionSteps,
  at: number,
): void {
  const { nZones, zoneOf, nLevels, levelOf, dx, dy, originX, originY } = groups;
  const size = nZones + 4 * nLevels;
  for (let k = 0; k < size; k++) work[k] = 0;
  for (let i = 0; i < nCells; i++) {
    const g = gamma[stride * i + offset];
    work[zoneOf[i]] += g;
    const b = nZones + 4 * levelOf[i];
    const x = dx[i];
    const y = dy[i];
    work[b] += g;
    work[b + 1] += g * x;
    work[b + 2] += g * y;
    work[b + 3] += g * (x * x + y * y);
  }
  let bestZone = 0;
  let bestZoneP = -1;
  for (let z = 0; z < nZones; z++) {
    if (work[z] > bestZoneP) {
      bestZoneP = work[z];
      bestZone = z;
    }
  }
  let bestLevel = 0;
  let bestMass = -1;
  for (let l = 0; l < nLevels; l++) {
    const mass = work[nZones + 4 * l];
    if (mass > bestMass) {
      bestMass = mass;
      bestLevel = l;
    }
  }
  const b = nZones + 4 * bestLevel;
  const mx = work[b + 1] / bestMass;
  const my = work[b + 2] / bestMass;
  const variance = work[b + 3] / bestMass - mx * mx - my * my;
  out.likelyZone[at] = bestZone;
  out.zoneP[at] = bestZoneP;
  out.meanLevel[at] = bestLevel;
  out.meanX[at] = originX[bestLevel] + mx;
  out.meanY[at] = originY[bestLevel] + my;
  out.spreadM[at] = Math.sqrt(variance > 0 ? variance : 0);
}
