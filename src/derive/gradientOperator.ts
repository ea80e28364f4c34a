/**
 * The quadratic least-squares gradient of `quadraticGradient.ts` written as a linear operator, for sites
 * whose gradient is wanted again and again on the same mesh (the wall nodes of a force total over every
 * step of a series). The fit depends on the values only through the right-hand side: at site i,
 *
 *     ∇f(x_i) ≈ Σ_j c_ij (f_j − f_i),   c_ij = (1/h) · rows 0..2 of P · (w_j a_j),
 *
 * with a_j the nine scaled monomials of the offset d_j/h, w_j = 1/|d_j/h|² and P the (pivot-dropping)
 * inverse of the normal-equation matrix — all geometry. So the choice of stencil (one-ring, or the
 * two-ring when the one-ring is one-sided or ill-conditioned), the scaling, the dropped unknowns and the
 * Cholesky factor are decided once, here, by the same rules and tolerances as the kernel, and each later
 * gradient costs three multiply-adds per neighbour and component. Results equal the kernel's to rounding
 * (tests/derive/gradientOperator.test.ts); the method is Barth & Frederickson (1990), see that file.
 *
 * Layout: target k's neighbours are `ids[offsets[k] .. offsets[k+1]-1]` (site indices), their coefficients
 * `coef[3·e + j]` for direction j (1 / length unit). A target with no neighbour at all has `offsets[k] ===
 * offsets[k+1]` and `empty[k] = 1`, and gets NaN, as from the kernel.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import type { Stencil } from './stencils.ts';

/** Relative pivot below which an unknown is dropped (as `quadraticGradient.ts`). */
const PIVOT_TOLERANCE = 1e-9;
/** Relative pivot below which the one-ring is refitted over the two-ring (as `quadraticGradient.ts`). */
const WIDEN_TOLERANCE = 1e-3;
/** One-ring offset ratio above which the ring counts as one-sided (as `quadraticGradient.ts`). */
const ONE_SIDED = 0.2;

/** A gradient operator at chosen sites (see the file comment). */
export interface GradientOperator {
  /** The sites, in the order of the result. */
  readonly targets: Int32Array;
  readonly offsets: Int32Array;
  readonly ids: Int32Array;
  /** Three coefficients per neighbour entry (1 / length unit). */
  readonly coef: Float64Array;
  /** 1 where a target has no neighbour (its gradient is NaN). */
  readonly empty: Uint8Array;
  /** Bytes held by the arrays above. */
  readonly bytes: number;
}

const M = new Float64Array(81);
const L = new Float64Array(81);
const diag0 = new Float64Array(9);
const dropped = new Uint8Array(9);
const Z = new Float64Array(27);
const A = new Float64Array(9);

/** Fit scale of site i over `list[lo..hi-1]`: 1/h, and the one-sidedness ratio; null without neighbours. */
function scaleOf(positions: Float64Array, i: number, list: Int32Array, lo: number, hi: number): { ih: number; skew: number } | null {
  const x0 = positions[3 * i]!, y0 = positions[3 * i + 1]!, z0 = positions[3 * i + 2]!;
  let h2 = 0, used = 0, mx = 0, my = 0, mz = 0;
  for (let s = lo; s < hi; s++) {
    const q = 3 * list[s]!, dx = positions[q]! - x0, dy = positions[q + 1]! - y0, dz = positions[q + 2]! - z0;
    const r2 = dx * dx + dy * dy + dz * dz;
    if (r2 > 0) { h2 += r2; used++; mx += dx; my += dy; mz += dz; }
  }
  if (used === 0) return null;
  const ih = 1 / Math.sqrt(h2 / used);
  return { ih, skew: Math.hypot(mx, my, mz) / used * ih };
}

/** Scaled monomials of neighbour q of site i into A; returns the weight w (0 when q sits on i). */
function monomials(positions: Float64Array, i: number, q: number, ih: number): number {
  const dx = (positions[3 * q]! - positions[3 * i]!) * ih, dy = (positions[3 * q + 1]! - positions[3 * i + 1]!) * ih;
  const dz = (positions[3 * q + 2]! - positions[3 * i + 2]!) * ih;
  const r2 = dx * dx + dy * dy + dz * dz;
  if (!(r2 > 0)) return 0;
  A[0] = dx; A[1] = dy; A[2] = dz; A[3] = 0.5 * dx * dx; A[4] = 0.5 * dy * dy; A[5] = 0.5 * dz * dz; A[6] = dx * dy; A[7] = dx * dz; A[8] = dy * dz;
  return 1 / r2;
}

/** Normal equations over `list[lo..hi-1]` into M (upper triangle), factored into L; returns the smallest relative pivot (0 if one was dropped). */
function factor(positions: Float64Array, i: number, list: Int32Array, lo: number, hi: number, ih: number): number {
  M.fill(0);
  for (let s = lo; s < hi; s++) {
    const w = monomials(positions, i, list[s]!, ih);
    if (w === 0) continue;
    for (let r = 0; r < 9; r++) { const wr = w * A[r]!; for (let c = r; c < 9; c++) M[9 * r + c]! += wr * A[c]!; }
  }
  for (let r = 0; r < 9; r++) diag0[r] = M[9 * r + r]!;
  let worst = 1;
  for (let j = 0; j < 9; j++) {
    let s = M[9 * j + j]!;
    for (let k = 0; k < j; k++) s -= L[9 * j + k]! * L[9 * j + k]!;
    if (!(s > PIVOT_TOLERANCE * diag0[j]!) || !(diag0[j]! > 0)) {
      dropped[j] = 1; L[9 * j + j] = 0; worst = 0;
      for (let r = j + 1; r < 9; r++) L[9 * r + j] = 0;
      continue;
    }
    dropped[j] = 0;
    if (s < worst * diag0[j]!) worst = s / diag0[j]!;
    const d = Math.sqrt(s);
    L[9 * j + j] = d;
    for (let r = j + 1; r < 9; r++) {
      let t = M[9 * j + r]!;
      for (let k = 0; k < j; k++) t -= L[9 * r + k]! * L[9 * j + k]!;
      L[9 * r + j] = t / d;
    }
  }
  return worst;
}

/** Rows 0..2 of the pivot-dropping inverse (P e_r, P symmetric) into Z[9r .. 9r+8]. */
function gradientRows(): void {
  for (let r = 0; r < 3; r++) {
    const o = 9 * r;
    for (let j = 0; j < 9; j++) {
      if (dropped[j]) { Z[o + j] = 0; continue; }
      let t = j === r ? 1 : 0;
      for (let k = 0; k < j; k++) t -= L[9 * j + k]! * Z[o + k]!;
      Z[o + j] = t / L[9 * j + j]!;
    }
    for (let j = 8; j >= 0; j--) {
      if (dropped[j]) { Z[o + j] = 0; continue; }
      let t = Z[o + j]!;
      for (let k = j + 1; k < 9; k++) t -= L[9 * k + j]! * Z[o + k]!;
      Z[o + j] = t / L[9 * j + j]!;
    }
  }
}

/**
 * Builds the operator at `targets` over `positions` (xyz per site, length unit) with `stencil` each site's
 * one-ring, by the kernel's rules (see the file comment).
 */
export function gradientOperator(positions: Float64Array, stencil: Stencil, targets: Int32Array): GradientOperator {
  const so = stencil.offsets, sid = stencil.ids, nSites = positions.length / 3;
  const stamp = new Int32Array(nSites).fill(-1);
  let ring = new Int32Array(256);
  const offsets = new Int32Array(targets.length + 1), empty = new Uint8Array(targets.length);
  let ids = new Int32Array(Math.max(64, 32 * targets.length)), coef = new Float64Array(3 * ids.length);
  let e = 0;
  for (let k = 0; k < targets.length; k++) {
    const i = targets[k]!;
    let list: Int32Array = sid, lo = so[i]!, hi = so[i + 1]!;
    let sc = scaleOf(positions, i, list, lo, hi);
    let ok = sc ? factor(positions, i, list, lo, hi, sc.ih) : -1;
    if (ok < WIDEN_TOLERANCE || (sc !== null && sc.skew > ONE_SIDED)) {
      // the two-ring, gathered in the kernel's order: each neighbour, then its own neighbours
      let m = 0;
      stamp[i] = k;
      for (let s = so[i]!; s < so[i + 1]!; s++) {
        const j = sid[s]!;
        for (let t = so[j]! - 1; t < so[j + 1]!; t++) {
          const q = t < so[j]! ? j : sid[t]!;
          if (stamp[q] === k) continue;
          stamp[q] = k;
          if (m === ring.length) { const g = new Int32Array(2 * m); g.set(ring); ring = g; }
          ring[m++] = q;
        }
      }
      list = ring; lo = 0; hi = m;
      sc = scaleOf(positions, i, list, lo, hi);
      ok = sc ? factor(positions, i, list, lo, hi, sc.ih) : -1;
    }
    if (ok < 0 || !sc) { empty[k] = 1; offsets[k + 1] = e; continue; }
    gradientRows();
    if (e + hi - lo > ids.length) {
      const n = Math.max(2 * ids.length, e + hi - lo), gi = new Int32Array(n), gc = new Float64Array(3 * n);
      gi.set(ids.subarray(0, e)); gc.set(coef.subarray(0, 3 * e)); ids = gi; coef = gc;
    }
    const ih = sc.ih;
    for (let s = lo; s < hi; s++) {
      const q = list[s]!, w = monomials(positions, i, q, ih);
      if (w === 0) continue;
      for (let r = 0; r < 3; r++) {
        let t = 0;
        for (let c = 0; c < 9; c++) t += Z[9 * r + c]! * A[c]!;
        coef[3 * e + r] = w * t * ih;
      }
      ids[e++] = q;
    }
    offsets[k + 1] = e;
  }
  const outIds = ids.slice(0, e), outCoef = coef.slice(0, 3 * e), outTargets = targets.slice();
  return {
    targets: outTargets, offsets, ids: outIds, coef: outCoef, empty,
    bytes: outTargets.byteLength + offsets.byteLength + outIds.byteLength + outCoef.byteLength + empty.byteLength,
  };
}

/**
 * Gradients of a field (`nc` components per site) at the operator's targets: a new Float64Array of
 * `targets.length · nc · 3`, component c's ∂/∂x_j at `[(k·nc + c)·3 + j]` (field unit per length unit),
 * the layout of `quadraticGradient`.
 */
export function applyGradientOperator(op: GradientOperator, values: NumericArray, nc: number): Float64Array {
  const n = op.targets.length, out = new Float64Array(n * nc * 3);
  const off = op.offsets, ids = op.ids, coef = op.coef, tg = op.targets;
  for (let k = 0; k < n; k++) {
    const ob = 3 * nc * k;
    if (op.empty[k]) { out.fill(NaN, ob, ob + 3 * nc); continue; }
    const i = tg[k]!, lo = off[k]!, hi = off[k + 1]!;
    if (nc === 3) {
      const f0 = values[3 * i]!, f1 = values[3 * i + 1]!, f2 = values[3 * i + 2]!;
      let g00 = 0, g01 = 0, g02 = 0, g10 = 0, g11 = 0, g12 = 0, g20 = 0, g21 = 0, g22 = 0;
      for (let e = lo; e < hi; e++) {
        const q = 3 * ids[e]!, cx = coef[3 * e]!, cy = coef[3 * e + 1]!, cz = coef[3 * e + 2]!;
        const d0 = values[q]! - f0, d1 = values[q + 1]! - f1, d2 = values[q + 2]! - f2;
        g00 += cx * d0; g01 += cy * d0; g02 += cz * d0;
        g10 += cx * d1; g11 += cy * d1; g12 += cz * d1;
        g20 += cx * d2; g21 += cy * d2; g22 += cz * d2;
      }
      out[ob] = g00; out[ob + 1] = g01; out[ob + 2] = g02; out[ob + 3] = g10; out[ob + 4] = g11; out[ob + 5] = g12;
      out[ob + 6] = g20; out[ob + 7] = g21; out[ob + 8] = g22;
      continue;
    }
    for (let c = 0; c < nc; c++) {
      const f0 = values[nc * i + c]!;
      let gx = 0, gy = 0, gz = 0;
      for (let e = lo; e < hi; e++) {
        const d = values[nc * ids[e]! + c]! - f0;
        gx += coef[3 * e]! * d; gy += coef[3 * e + 1]! * d; gz += coef[3 * e + 2]! * d;
      }
      out[ob + 3 * c] = gx; out[ob + 3 * c + 1] = gy; out[ob + 3 * c + 2] = gz;
    }
  }
  return out;
}
