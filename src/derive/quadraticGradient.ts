/**
 * Gradients of a sampled field by a weighted least-squares fit of a complete quadratic polynomial over
 * each site's neighbourhood — the quadratic ("k-exact", k = 2) reconstruction of Barth & Frederickson
 * (1990), "Higher order solution of the Euler equations on unstructured grids using quadratic
 * reconstruction", AIAA 90-0013.
 *
 * At site i with value f_i, the fit f(x) ≈ f_i + g·d + ½ dᵀH d (d = x − x_i; 3 gradient + 6 Hessian
 * unknowns) minimises Σ_j w_j (f_i + g·d_j + ½ d_jᵀH d_j − f_j)² over the stencil, with inverse-square
 * distance weights w_j = 1/|d_j|². The fit reproduces any quadratic field exactly, so the gradient is
 * second-order accurate (error O(h²)) on smooth fields on any cell shape. Offsets are scaled by the
 * stencil's RMS distance so the 9×9 normal equations are O(1); they are solved by Cholesky with an
 * unknown dropped when its pivot vanishes (a single layer of cells cannot see a curvature across it, a
 * flat mesh no gradient across it), so degenerate stencils fall back to a lower-order fit instead of
 * failing.
 *
 * Layout of the result: site k (the k-th target), component c, direction j at `out[(k·nc + c)·3 + j]`
 * — for a velocity, ∂u_c/∂x_j row by row. Units: the field's unit per length unit.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import type { Stencil } from './stencils.ts';

/** Relative pivot below which an unknown is dropped from the fit. */
const PIVOT_TOLERANCE = 1e-9;
/**
 * Relative pivot below which the one-ring is refitted over the two-ring: a node on a boundary face sees
 * only two layers of nodes across it, too few to tell a curvature across the face from a slope.
 */
const WIDEN_TOLERANCE = 1e-3;
/**
 * Offset of a one-ring's mean from its site, relative to the ring's RMS distance, above which the ring
 * counts as one-sided (a node on the boundary) and the two-ring is used: its curvature across the
 * boundary is otherwise resolved from the small scatter of one layer of nodes.
 */
const ONE_SIDED = 0.2;
/** Offset ratio of the last fit's neighbours (see ONE_SIDED). */
let lastSkew = 0;

const M = new Float64Array(81);
const L = new Float64Array(81);
const diag0 = new Float64Array(9);
const dropped = new Uint8Array(9);
const a = new Float64Array(9);
let B = new Float64Array(27);
let Y = new Float64Array(27);
let ring = new Int32Array(256);
let stamp = new Int32Array(0);

/**
 * Gradients at the `targets` sites (default: every site). `positions` holds one xyz per site, `values`
 * `nc` components per site, `stencil` each site's one-ring of neighbours. Returns a new Float64Array of
 * `targets.length · nc · 3` (see the file comment). A site with no neighbours gets NaN.
 */
export function quadraticGradient(positions: Float64Array, values: NumericArray, nc: number, stencil: Stencil,
  targets?: Int32Array): Float64Array {
  const nSites = positions.length / 3, count = targets ? targets.length : nSites;
  const out = new Float64Array(count * nc * 3);
  if (B.length < 9 * nc) { B = new Float64Array(9 * nc); Y = new Float64Array(9 * nc); }
  if (stamp.length < nSites) stamp = new Int32Array(nSites);
  stamp.fill(-1, 0, nSites);
  const so = stencil.offsets, sid = stencil.ids;
  for (let k = 0; k < count; k++) {
    const i = targets ? targets[k]! : k;
    const ob = k * nc * 3;
    let ok = fit(positions, values, nc, i, sid, so[i]!, so[i + 1]!);
    if (ok < WIDEN_TOLERANCE || lastSkew > ONE_SIDED) {
      const m = twoRing(so, sid, i, k);
      ok = fit(positions, values, nc, i, ring, 0, m);
    }
    if (ok < 0) { for (let c = 0; c < 3 * nc; c++) out[ob + c] = NaN; continue; }
    for (let c = 0; c < nc; c++) { out[ob + 3 * c] = Y[9 * c]!; out[ob + 3 * c + 1] = Y[9 * c + 1]!; out[ob + 3 * c + 2] = Y[9 * c + 2]!; }
  }
  return out;
}

/** Gathers the two-ring of site `i` (without `i`) into `ring`; returns its length. `mark` is unique per call. */
function twoRing(so: Int32Array, sid: Int32Array, i: number, mark: number): number {
  let m = 0;
  stamp[i] = mark;
  for (let s = so[i]!; s < so[i + 1]!; s++) {
    const j = sid[s]!;
    for (let t = so[j]! - 1; t < so[j + 1]!; t++) {
      const q = t < so[j]! ? j : sid[t]!;
      if (stamp[q] === mark) continue;
      stamp[q] = mark;
      if (m === ring.length) { const g = new Int32Array(2 * m); g.set(ring); ring = g; }
      ring[m++] = q;
    }
  }
  return m;
}

/**
 * Fits the quadratic at site `i` over neighbours `list[lo..hi-1]`; leaves the gradient (field unit per
 * length unit) in `Y[9c + 0..2]`. Returns the smallest relative pivot of the kept unknowns among the
 * gradient and curvature terms (1 = perfectly conditioned), 0 when an unknown was dropped, −1 when
 * there is no neighbour at all.
 */
function fit(positions: Float64Array, values: NumericArray, nc: number, i: number, list: Int32Array, lo: number, hi: number): number {
  const x0 = positions[3 * i]!, y0 = positions[3 * i + 1]!, z0 = positions[3 * i + 2]!;
  let h2 = 0, used = 0, mx = 0, my = 0, mz = 0;
  for (let s = lo; s < hi; s++) {
    const q = 3 * list[s]!, dx = positions[q]! - x0, dy = positions[q + 1]! - y0, dz = positions[q + 2]! - z0;
    const r2 = dx * dx + dy * dy + dz * dz;
    if (r2 > 0) { h2 += r2; used++; mx += dx; my += dy; mz += dz; }
  }
  if (used === 0) return -1;
  const ih = 1 / Math.sqrt(h2 / used);
  lastSkew = Math.hypot(mx, my, mz) / used * ih;
  M.fill(0); B.fill(0, 0, 9 * nc);
  for (let s = lo; s < hi; s++) {
    const j = list[s]!, q = 3 * j;
    const dx = (positions[q]! - x0) * ih, dy = (positions[q + 1]! - y0) * ih, dz = (positions[q + 2]! - z0) * ih;
    const r2 = dx * dx + dy * dy + dz * dz;
    if (!(r2 > 0)) continue;
    const w = 1 / r2;
    a[0] = dx; a[1] = dy; a[2] = dz; a[3] = 0.5 * dx * dx; a[4] = 0.5 * dy * dy; a[5] = 0.5 * dz * dz;
    a[6] = dx * dy; a[7] = dx * dz; a[8] = dy * dz;
    for (let r = 0; r < 9; r++) {
      const wr = w * a[r]!;
      for (let t = r; t < 9; t++) M[9 * r + t]! += wr * a[t]!;
      for (let c = 0; c < nc; c++) B[9 * c + r]! += wr * (values[j * nc + c]! - values[i * nc + c]!);
    }
  }
  const worst = solve(nc);
  for (let c = 0; c < nc; c++) { Y[9 * c]! *= ih; Y[9 * c + 1]! *= ih; Y[9 * c + 2]! *= ih; }
  return worst;
}

/**
 * Solves M y = B (upper triangle of M filled) for `nc` right-hand sides into Y, dropping vanishing pivots;
 * returns the smallest relative pivot (0 when one was dropped).
 */
function solve(nc: number): number {
  for (let r = 0; r < 9; r++) diag0[r] = M[9 * r + r]!;
  let worst = 1;
  for (let j = 0; j < 9; j++) {
    let s = M[9 * j + j]!;
    for (let k = 0; k < j; k++) s -= L[9 * j + k]! * L[9 * j + k]!;
    if (!(s > PIVOT_TOLERANCE * diag0[j]!) || !(diag0[j]! > 0)) {
      dropped[j] = 1; L[9 * j + j] = 0; worst = 0;
      for (let i = j + 1; i < 9; i++) L[9 * i + j] = 0;
      continue;
    }
    dropped[j] = 0;
    if (s < worst * diag0[j]!) worst = s / diag0[j]!;
    const d = Math.sqrt(s);
    L[9 * j + j] = d;
    for (let i = j + 1; i < 9; i++) {
      let t = M[9 * j + i]!;
      for (let k = 0; k < j; k++) t -= L[9 * i + k]! * L[9 * j + k]!;
      L[9 * i + j] = t / d;
    }
  }
  for (let c = 0; c < nc; c++) {
    const o = 9 * c;
    for (let j = 0; j < 9; j++) {
      if (dropped[j]) { Y[o + j] = 0; continue; }
      let t = B[o + j]!;
      for (let k = 0; k < j; k++) t -= L[9 * j + k]! * Y[o + k]!;
      Y[o + j] = t / L[9 * j + j]!;
    }
    for (let j = 8; j >= 0; j--) {
      if (dropped[j]) { Y[o + j] = 0; continue; }
      let t = Y[o + j]!;
      for (let k = j + 1; k < 9; k++) t -= L[9 * k + j]! * Y[o + k]!;
      Y[o + j] = t / L[9 * j + j]!;
    }
  }
  return worst;
}
