import type { MoveAccumulators } from '../kernels/backward-move-segment.js';
import { DISTANCE_BINS, DISTANCE_BIN_METRES, HEADING_BINS, HEADING_BIN_DEGREES } from '../kernels/move-chain.js';
import type { HmmModel, MovementParams } from './hmm-model.js';
import { chainFromModel } from './chain-from-model.js';
import { linkBearings } from './link-bearings.js';

/** Bounds that keep the parameters finite when the counts push them away (e.g. no stays at all). */
const LOGIT_BOUND = 30;
const PER_METRE_BOUND = 200;
const KAPPA_BOUND = 200;
const MAX_NEWTON = 60;

/**
 * M-step of the movement parameters (`tied` mode): maximises the expected complete-data log-likelihood
 * of the transitions that depend on them, given the E-step's movement counts:
 *
 *   Q_s(a, b) = Σ_d S_d log σ(a − b·d) + M_d log(1 − σ(a − b·d))        (stays S, moves M per distance bin)
 *   Q_κ(κ)   = Σ_h Σ_i Σ_{i → j} C_hij log split_h(i → j; κ)           (link uses C per heading bin,
 *                                                                        through their sufficient counts)
 *
 * Both are concave (a weighted logistic regression; a log-linear split), so each is climbed by Newton
 * steps with step halving, a step taken only when it raises Q: a generalised EM step that never lowers
 * Q, so the fit's objective never decreases. The two parts share no parameter and are maximised
 * separately. `model` supplies the plain split (its links) and the link bearings.
 */
export function maximizeMovement(model: HmmModel, params: MovementParams, acc: MoveAccumulators): MovementParams {
  const [stayLogit, stayPerMetre] = maximizeStay(params.stayLogit, params.stayPerMetre, acc.stayByDistance, acc.moveByDistance);
  const kappa = maximizeKappa(model, params.kappa, acc);
  return { stayLogit, stayPerMetre, kappa };
}

function logSigmoid(z: number): number {
  return z >= 0 ? -Math.log1p(Math.exp(-z)) : z - Math.log1p(Math.exp(z));
}

/** Q_s and its derivatives at (a, b). */
function stayQ(a: number, b: number, stays: Float64Array, moves: Float64Array, wantDerivatives: boolean): { q: number; ga: number; gb: number; haa: number; hab: number; hbb: number } {
  let q = 0;
  let ga = 0;
  let gb = 0;
  let haa = 0;
  let hab = 0;
  let hbb = 0;
  for (let k = 0; k < DISTANCE_BINS; k++) {
    const s = stays[k];
    const m = moves[k];
    if (s === 0 && m === 0) continue;
    const x = k * DISTANCE_BIN_METRES;
    const z = a - b * x;
    q += (s > 0 ? s * logSigmoid(z) : 0) + (m > 0 ? m * logSigmoid(-z) : 0);
    if (!wantDerivatives) continue;
    const p = z >= 0 ? 1 / (1 + Math.exp(-z)) : Math.exp(z) / (1 + Math.exp(z));
    const r = s - (s + m) * p;
    const w = (s + m) * p * (1 - p);
    ga += r;
    gb -= r * x;
    haa -= w;
    hab += w * x;
    hbb -= w * x * x;
  }
  return { q, ga, gb, haa, hab, hbb };
}

function maximizeStay(a0: number, b0: number, stays: Float64Array, moves: Float64Array): [number, number] {
  let a = a0;
  let b = b0;
  let cur = stayQ(a, b, stays, moves, true);
  if (cur.q === 0 && cur.ga === 0 && cur.gb === 0) return [a, b]; // no counts
  for (let it = 0; it < MAX_NEWTON; it++) {
    // Newton direction (the Hessian is negative semi-definite); gradient ascent when it is singular.
    const det = cur.haa * cur.hbb - cur.hab * cur.hab;
    let da: number;
    let db: number;
    if (det > 1e-300 && cur.haa < 0) {
      da = -(cur.hbb * cur.ga - cur.hab * cur.gb) / det;
      db = -(-cur.hab * cur.ga + cur.haa * cur.gb) / det;
    } else {
      da = cur.ga;
      db = cur.gb;
    }
    let step = 1;
    let moved = false;
    for (let half = 0; half < 40; half++, step /= 2) {
      const na = clamp(a + step * da, LOGIT_BOUND);
      const nb = clamp(b + step * db, PER_METRE_BOUND);
      const next = stayQ(na, nb, stays, moves, false);
      if (next.q > cur.q) {
        const gain = next.q - cur.q;
        a = na;
        b = nb;
        cur = stayQ(a, b, stays, moves, true);
        moved = gain > 1e-12 * Math.abs(cur.q);
        break;
      }
    }
    if (!moved) break;
  }
  return [a, b];
}

function clamp(x: number, bound: number): number {
  return Math.max(-bound, Math.min(bound, x));
}

/**
 * Q_κ and its first two derivatives, from the compact counts: per heading bin h and cell i the moves
 * C_hi, per bin X_h = Σ ξ cos θ and Y_h = Σ ξ sin θ. With c_q = cos(h − θ_q) (0 without a bearing) and
 * the plain split p_q over i's links, Z_hi(κ) = Σ_q p_q e^{κ (c_q − 1)}:
 *   Q = Σ_h κ (cos h · X_h + sin h · Y_h) − Σ_{h,i} C_hi (κ + log Z_hi) + const,
 *   Q' = Σ_h (cos h · X_h + sin h · Y_h) − Σ C_hi E_hi[c],   Q'' = −Σ C_hi Var_hi[c].
 */
function kappaQ(kappa: number, cosines: Float64Array, base: Float64Array, outPtr: Int32Array, linear: number, moves: Float64Array, active: Int32Array, n: number): [number, number, number] {
  const nLinks = base.length;
  let q = kappa * linear;
  let g = linear;
  let h = 0;
  for (let x = 0; x < active.length; x += 2) {
    const hb = active[x];
    const i = active[x + 1];
    const off = hb * nLinks;
    const ci = moves[hb * n + i];
    let z = 0;
    let m1 = 0;
    let m2 = 0;
    for (let k = outPtr[i]; k < outPtr[i + 1]; k++) {
      const c = cosines[off + k];
      const v = base[k] * Math.exp(kappa * (c - 1));
      z += v;
      m1 += v * c;
      m2 += v * c * c;
    }
    if (z <= 0) continue;
    const mean = m1 / z;
    q -= ci * (kappa + Math.log(z));
    g -= ci * mean;
    h -= ci * (m2 / z - mean * mean);
  }
  return [q, g, h];
}

function maximizeKappa(model: HmmModel, kappa0: number, acc: MoveAccumulators): number {
  const chain = chainFromModel({ ...model, movement: undefined });
  const { outPtr, outProb } = chain;
  const n = chain.nCells;
  const nLinks = outPtr[n];
  const bearings = linkBearings(model.structure, model.cells);
  // The (heading bin, cell) pairs with moves, every link's cosine per bin, and the linear term.
  const active: number[] = [];
  const cosines = new Float64Array(HEADING_BINS * nLinks);
  let linear = 0;
  for (let hb = 0; hb < HEADING_BINS; hb++) {
    const hd = ((hb + 0.5) * HEADING_BIN_DEGREES * Math.PI) / 180;
    linear += Math.cos(hd) * acc.headingCos[hb] + Math.sin(hd) * acc.headingSin[hb];
    for (let i = 0; i < n; i++) {
      for (let k = outPtr[i]; k < outPtr[i + 1]; k++) cosines[hb * nLinks + k] = Number.isNaN(bearings[k]) ? 0 : Math.cos(hd - bearings[k]);
      if (acc.moveByHeading[hb * n + i] > 0 && outPtr[i + 1] > outPtr[i]) active.push(hb, i);
    }
  }
  if (active.length === 0) return kappa0;
  const act = Int32Array.from(active);
  const moves = acc.moveByHeading;
  let kappa = kappa0;
  let [q, g, h] = kappaQ(kappa, cosines, outProb, outPtr, linear, moves, act, n);
  for (let it = 0; it < MAX_NEWTON; it++) {
    const dir = h < 0 ? -g / h : g;
    let step = 1;
    let moved = false;
    for (let half = 0; half < 40; half++, step /= 2) {
      const nk = Math.max(0, Math.min(KAPPA_BOUND, kappa + step * dir));
      const [nq] = kappaQ(nk, cosines, outProb, outPtr, linear, moves, act, n);
      if (nq > q) {
        const gain = nq - q;
        kappa = nk;
        [q, g, h] = kappaQ(kappa, cosines, outProb, outPtr, linear, moves, act, n);
        moved = gain > 1e-12 * Math.abs(q);
        break;
      }
    }
    if (!moved) break;
  }
  return kappa;
}
