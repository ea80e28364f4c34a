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
  // normal equations accumulated in locals (45 matrix entries, 9 right-hand sides per component up to 3)
  let m00 = 0, m01 = 0, m02 = 0, m03 = 0, m04 = 0, m05 = 0, m06 = 0, m07 = 0, m08 = 0, m11 = 0, m12 = 0, m13 = 0, m14 = 0, m15 = 0, m16 = 0, m17 = 0, m18 = 0, m22 = 0, m23 = 0, m24 = 0, m25 = 0, m26 = 0, m27 = 0, m28 = 0, m33 = 0, m34 = 0, m35 = 0, m36 = 0, m37 = 0, m38 = 0, m44 = 0, m45 = 0, m46 = 0, m47 = 0, m48 = 0, m55 = 0, m56 = 0, m57 = 0, m58 = 0, m66 = 0, m67 = 0, m68 = 0, m77 = 0, m78 = 0, m88 = 0;
  let b0_0 = 0, b1_0 = 0, b2_0 = 0, b3_0 = 0, b4_0 = 0, b5_0 = 0, b6_0 = 0, b7_0 = 0, b8_0 = 0, b0_1 = 0, b1_1 = 0, b2_1 = 0, b3_1 = 0, b4_1 = 0, b5_1 = 0, b6_1 = 0, b7_1 = 0, b8_1 = 0, b0_2 = 0, b1_2 = 0, b2_2 = 0, b3_2 = 0, b4_2 = 0, b5_2 = 0, b6_2 = 0, b7_2 = 0, b8_2 = 0;
  if (nc !== 1 && nc !== 3) B.fill(0, 0, 9 * nc);
  const f0 = values[i * nc]!, f1 = nc > 1 ? values[i * nc + 1]! : 0, f2 = nc > 2 ? values[i * nc + 2]! : 0;
  for (let s = lo; s < hi; s++) {
    const j = list[s]!, q = 3 * j;
    const dx = (positions[q]! - x0) * ih, dy = (positions[q + 1]! - y0) * ih, dz = (positions[q + 2]! - z0) * ih;
    const r2 = dx * dx + dy * dy + dz * dz;
    if (!(r2 > 0)) continue;
    const w = 1 / r2;
    const a0 = dx, a1 = dy, a2 = dz, a3 = 0.5 * dx * dx, a4 = 0.5 * dy * dy, a5 = 0.5 * dz * dz, a6 = dx * dy, a7 = dx * dz, a8 = dy * dz;
    const w0 = w * a0, w1 = w * a1, w2 = w * a2, w3 = w * a3, w4 = w * a4, w5 = w * a5, w6 = w * a6, w7 = w * a7, w8 = w * a8;
    m00 += w0 * a0; m01 += w0 * a1; m02 += w0 * a2; m03 += w0 * a3; m04 += w0 * a4; m05 += w0 * a5; m06 += w0 * a6; m07 += w0 * a7; m08 += w0 * a8;
    m11 += w1 * a1; m12 += w1 * a2; m13 += w1 * a3; m14 += w1 * a4; m15 += w1 * a5; m16 += w1 * a6; m17 += w1 * a7; m18 += w1 * a8;
    m22 += w2 * a2; m23 += w2 * a3; m24 += w2 * a4; m25 += w2 * a5; m26 += w2 * a6; m27 += w2 * a7; m28 += w2 * a8;
    m33 += w3 * a3; m34 += w3 * a4; m35 += w3 * a5; m36 += w3 * a6; m37 += w3 * a7; m38 += w3 * a8;
    m44 += w4 * a4; m45 += w4 * a5; m46 += w4 * a6; m47 += w4 * a7; m48 += w4 * a8;
    m55 += w5 * a5; m56 += w5 * a6; m57 += w5 * a7; m58 += w5 * a8;
    m66 += w6 * a6; m67 += w6 * a7; m68 += w6 * a8;
    m77 += w7 * a7; m78 += w7 * a8;
    m88 += w8 * a8;
    const g0 = values[j * nc]! - f0;
    b0_0 += w0 * g0; b1_0 += w1 * g0; b2_0 += w2 * g0; b3_0 += w3 * g0; b4_0 += w4 * g0; b5_0 += w5 * g0; b6_0 += w6 * g0; b7_0 += w7 * g0; b8_0 += w8 * g0;
    if (nc === 3) {
      const g1 = values[j * nc + 1]! - f1, g2 = values[j * nc + 2]! - f2;
      b0_1 += w0 * g1; b1_1 += w1 * g1; b2_1 += w2 * g1; b3_1 += w3 * g1; b4_1 += w4 * g1; b5_1 += w5 * g1; b6_1 += w6 * g1; b7_1 += w7 * g1; b8_1 += w8 * g1;
      b0_2 += w0 * g2; b1_2 += w1 * g2; b2_2 += w2 * g2; b3_2 += w3 * g2; b4_2 += w4 * g2; b5_2 += w5 * g2; b6_2 += w6 * g2; b7_2 += w7 * g2; b8_2 += w8 * g2;
    } else if (nc > 1) {
      for (let c = 1; c < nc; c++) {
        const g = values[j * nc + c]! - values[i * nc + c]!;
        B[9 * c + 0]! += w0 * g; B[9 * c + 1]! += w1 * g; B[9 * c + 2]! += w2 * g; B[9 * c + 3]! += w3 * g; B[9 * c + 4]! += w4 * g; B[9 * c + 5]! += w5 * g; B[9 * c + 6]! += w6 * g; B[9 * c + 7]! += w7 * g; B[9 * c + 8]! += w8 * g;
      }
    }
  }
  M[0] = m00; M[1] = m01; M[2] = m02; M[3] = m03; M[4] = m04; M[5] = m05; M[6] = m06; M[7] = m07; M[8] = m08; M[10] = m11; M[11] = m12; M[12] = m13; M[13] = m14; M[14] = m15; M[15] = m16; M[16] = m17; M[17] = m18; M[20] = m22; M[21] = m23; M[22] = m24; M[23] = m25; M[24] = m26; M[25] = m27; M[26] = m28; M[30] = m33; M[31] = m34; M[32] = m35; M[33] = m36; M[34] = m37; M[35] = m38; M[40] = m44; M[41] = m45; M[42] = m46; M[43] = m47; M[44] = m48; M[50] = m55; M[51] = m56; M[52] = m57; M[53] = m58; M[60] = m66; M[61] = m67; M[62] = m68; M[70] = m77; M[71] = m78; M[80] = m88;
  B[0] = b0_0; B[1] = b1_0; B[2] = b2_0; B[3] = b3_0; B[4] = b4_0; B[5] = b5_0; B[6] = b6_0; B[7] = b7_0; B[8] = b8_0;
  if (nc === 3) { B[9] = b0_1; B[18] = b0_2; B[10] = b1_1; B[19] = b1_2; B[11] = b2_1; B[20] = b2_2; B[12] = b3_1; B[21] = b3_2; B[13] = b4_1; B[22] = b4_2; B[14] = b5_1; B[23] = b5_2; B[15] = b6_1; B[24] = b6_2; B[16] = b7_1; B[25] = b7_2; B[17] = b8_1; B[26] = b8_2; }
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
