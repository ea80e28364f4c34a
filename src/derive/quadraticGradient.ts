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
 * stencil's RMS distance so the 9×9 normal equations are O(1). Their 45 entries are products of the
 * monomials, so they are summed as the 31 distinct weighted moments Σ w x^a y^b z^c (2 ≤ a+b+c ≤ 4)
 * and assembled once per site; they are solved by Cholesky (solveNine.ts) with an unknown dropped when
 * its pivot vanishes (a single layer of cells cannot see a curvature across it, a
 * flat mesh no gradient across it), so degenerate stencils fall back to a lower-order fit instead of
 * failing.
 *
 * Layout of the result: site k (the k-th target), component c, direction j at `out[(k·nc + c)·3 + j]`
 * — for a velocity, ∂u_c/∂x_j row by row. Units: the field's unit per length unit.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { factorNine, gradientNine } from './solveNine.ts';
import type { Stencil } from './stencils.ts';
import { beginSites, ringIds, twoRing } from './neighbourRing.ts';
import { ONE_SIDED, PIVOT_TOLERANCE, SKEWED, WIDEN_TOLERANCE } from './fitTolerances.ts';
import { momentKernel } from './momentKernel.ts';
import { pairedInto } from './pairedFit.ts';

export { beginSites };

const Mp = new Float64Array(45);
const Lp = new Float64Array(45);
const inv = new Float64Array(9);
let B = new Float64Array(27);
let Y = new Float64Array(27);
/** The last fit's scaled neighbour offsets and weights (0 for a coincident neighbour), in list order. */
let X = new Float64Array(256);
let Yo = new Float64Array(256);
let Z = new Float64Array(256);
let W = new Float64Array(256);

/**
 * The neighbours and scale of the last `fitSite`: the site's fit runs over `list[lo .. hi-1]` with offsets
 * scaled by `ih` (1 / RMS neighbour distance); its normal matrix is factorised in the module's scratch.
 */
export const lastSite: { list: Int32Array; lo: number; hi: number; ih: number } = { list: ringIds(), lo: 0, hi: 0, ih: 0.5 };

/**
 * Gradients at the `targets` sites (default: every site). `positions` holds one xyz per site, `values`
 * `nc` components per site, `stencil` each site's one-ring of neighbours. Returns a new Float64Array of
 * `targets.length · nc · 3` (see the file comment). A site with no neighbours gets NaN.
 */
export function quadraticGradient(positions: Float64Array, values: NumericArray, nc: number, stencil: Stencil,
  targets?: Int32Array): Float64Array {
  const count = targets ? targets.length : positions.length / 3;
  const out = new Float64Array(count * nc * 3);
  gradientInto(out, 0, positions, values, nc, stencil, targets, 0, count);
  return out;
}

/**
 * The gradients of sites `from .. to-1` (indices into `targets`, or sites themselves when `targets` is
 * undefined), written to `out` from `outStart` on in the layout of `quadraticGradient` (site `from`
 * first); `ringSizes[k]`, when given, receives the number of neighbours site k's fit used. A caller may split the sites into shares that each fill their own slice: every site's result
 * is the same whichever share computes it.
 */
export function gradientInto(out: Float64Array, outStart: number, positions: Float64Array, values: NumericArray, nc: number,
  stencil: Stencil, targets: Int32Array | undefined, from: number, to: number, ringSizes?: Int32Array): void {
  if (B.length < 9 * nc) { B = new Float64Array(9 * nc); Y = new Float64Array(9 * nc); }
  beginSites(positions.length / 3);
  if (nc === 1 || nc === 3) {
    const kernel = momentKernel();
    if (kernel) pairedInto(kernel, out, outStart, positions, values, nc, stencil, targets, from, to, ringSizes);
    else fusedInto(out, outStart, positions, values, nc, stencil, targets, from, to, ringSizes);
    return;
  }
  for (let k = from; k < to; k++) {
    const i = targets ? targets[k]! : k;
    const ob = outStart + (k - from) * nc * 3;
    const ok = fitSite(positions, stencil, i, k);
    if (ringSizes) ringSizes[k] = ok < 0 ? 0 : lastSite.hi - lastSite.lo;
    if (ok < 0) { for (let c = 0; c < 3 * nc; c++) out[ob + c] = NaN; continue; }
    solveSite(values, nc, i);
    for (let c = 0; c < nc; c++) { out[ob + 3 * c] = Y[9 * c]!; out[ob + 3 * c + 1] = Y[9 * c + 1]!; out[ob + 3 * c + 2] = Y[9 * c + 2]!; }
  }
}

/**
 * `gradientInto` for 1 or 3 components: the same fit and solve as `fitSite` + `solveSite`, with the
 * right-hand sides summed in the moments' loop (one pass over the neighbours instead of two). Every product
 * and sum is the one the two-pass route makes, in the same order, so the results are the same to the bit.
 */
function fusedInto(out: Float64Array, outStart: number, positions: Float64Array, values: NumericArray, nc: number,
  stencil: Stencil, targets: Int32Array | undefined, from: number, to: number, ringSizes: Int32Array | undefined): void {
  const so = stencil.offsets, sid = stencil.ids, w = 3 * nc;
  for (let k = from; k < to; k++) {
    const i = targets ? targets[k]! : k;
    const ob = outStart + (k - from) * w;
    let n = so[i + 1]! - so[i]!;
    let ok = fitSums(positions, values, nc, i, sid, so[i]!, so[i + 1]!, true);
    if (!(ok >= WIDEN_TOLERANCE)) {
      n = twoRing(so, sid, i, k);
      ok = fitSums(positions, values, nc, i, ringIds(), 0, n, false);
    }
    if (ringSizes) ringSizes[k] = ok < 0 ? 0 : n;
    if (ok < 0) { for (let c = 0; c < w; c++) out[ob + c] = NaN; continue; }
    const ih = lastSite.ih;
    for (let c = 0; c < nc; c++) {
      gradientNine(Lp, inv, B, Y, 9 * c);
      out[ob + 3 * c] = Y[9 * c]! * ih; out[ob + 3 * c + 1] = Y[9 * c + 1]! * ih; out[ob + 3 * c + 2] = Y[9 * c + 2]! * ih;
    }
  }
}

/**
 * `fitGeometry` that also sums the right-hand sides Σ w m_a Δf of `values` (1 or 3 components) into `B`
 * (the ½ of the square terms applied), in the same loop as the moments. Same returns as `fitGeometry`.
 */
function fitSums(positions: Float64Array, values: NumericArray, nc: number, i: number, list: Int32Array, lo: number, hi: number,
  skipOneSided: boolean): number {
  const x0 = positions[3 * i]!, y0 = positions[3 * i + 1]!, z0 = positions[3 * i + 2]!;
  const n = hi - lo;
  if (X.length < n) { const m = Math.max(n, 2 * X.length); X = new Float64Array(m); Yo = new Float64Array(m); Z = new Float64Array(m); W = new Float64Array(m); }
  let h2 = 0, used = 0, mx = 0, my = 0, mz = 0;
  for (let s = lo, t = 0; s < hi; s++, t++) {
    const q = 3 * list[s]!, dx = positions[q]! - x0, dy = positions[q + 1]! - y0, dz = positions[q + 2]! - z0;
    X[t] = dx; Yo[t] = dy; Z[t] = dz;
    const r2 = dx * dx + dy * dy + dz * dz;
    if (r2 > 0) { h2 += r2; used++; mx += dx; my += dy; mz += dz; }
  }
  if (used === 0) return -1;
  const ih = 1 / Math.sqrt(h2 / used);
  lastSite.ih = ih;
  if (skipOneSided && Math.hypot(mx, my, mz) / used * ih > ONE_SIDED) return SKEWED;
  const three = nc === 3;
  const f0 = values[i * nc]!, f1 = three ? values[i * nc + 1]! : 0, f2 = three ? values[i * nc + 2]! : 0;
  let sxx = 0, syy = 0, szz = 0, sxy = 0, sxz = 0, syz = 0;
  let txxx = 0, txxy = 0, txxz = 0, txyy = 0, tyyy = 0, tyyz = 0, txzz = 0, tyzz = 0, tzzz = 0, txyz = 0;
  let qxxxx = 0, qyyyy = 0, qzzzz = 0, qxxxy = 0, qxxxz = 0, qxyyy = 0, qyyyz = 0, qxzzz = 0, qyzzz = 0;
  let qxxyy = 0, qxxzz = 0, qyyzz = 0, qxxyz = 0, qxyyz = 0, qxyzz = 0;
  let b0_0 = 0, b1_0 = 0, b2_0 = 0, b3_0 = 0, b4_0 = 0, b5_0 = 0, b6_0 = 0, b7_0 = 0, b8_0 = 0;
  let b0_1 = 0, b1_1 = 0, b2_1 = 0, b3_1 = 0, b4_1 = 0, b5_1 = 0, b6_1 = 0, b7_1 = 0, b8_1 = 0;
  let b0_2 = 0, b1_2 = 0, b2_2 = 0, b3_2 = 0, b4_2 = 0, b5_2 = 0, b6_2 = 0, b7_2 = 0, b8_2 = 0;
  for (let t = 0, s = lo; t < n; t++, s++) {
    const x = X[t]! * ih, y = Yo[t]! * ih, z = Z[t]! * ih;
    const r2 = x * x + y * y + z * z;
    if (!(r2 > 0)) continue;
    const w = 1 / r2;
    const wx = w * x, wy = w * y, wz = w * z;
    const wxx = wx * x, wyy = wy * y, wzz = wz * z, wxy = wx * y, wxz = wx * z, wyz = wy * z;
    const xx = x * x, yy = y * y, zz = z * z, xy = x * y, xz = x * z, yz = y * z;
    sxx += wxx; syy += wyy; szz += wzz; sxy += wxy; sxz += wxz; syz += wyz;
    txxx += wxx * x; txxy += wxx * y; txxz += wxx * z; txyy += wyy * x; tyyy += wyy * y; tyyz += wyy * z;
    txzz += wzz * x; tyzz += wzz * y; tzzz += wzz * z; txyz += wxy * z;
    qxxxx += wxx * xx; qyyyy += wyy * yy; qzzzz += wzz * zz; qxxxy += wxx * xy; qxxxz += wxx * xz; qxyyy += wyy * xy;
    qyyyz += wyy * yz; qxzzz += wzz * xz; qyzzz += wzz * yz; qxxyy += wxx * yy; qxxzz += wxx * zz; qyyzz += wyy * zz;
    qxxyz += wxx * yz; qxyyz += wyy * xz; qxyzz += wzz * xy;
    const j = list[s]! * nc;
    const g0 = values[j]! - f0;
    b0_0 += wx * g0; b1_0 += wy * g0; b2_0 += wz * g0; b3_0 += wxx * g0; b4_0 += wyy * g0; b5_0 += wzz * g0; b6_0 += wxy * g0; b7_0 += wxz * g0; b8_0 += wyz * g0;
    if (three) {
      const g1 = values[j + 1]! - f1, g2 = values[j + 2]! - f2;
      b0_1 += wx * g1; b1_1 += wy * g1; b2_1 += wz * g1; b3_1 += wxx * g1; b4_1 += wyy * g1; b5_1 += wzz * g1; b6_1 += wxy * g1; b7_1 += wxz * g1; b8_1 += wyz * g1;
      b0_2 += wx * g2; b1_2 += wy * g2; b2_2 += wz * g2; b3_2 += wxx * g2; b4_2 += wyy * g2; b5_2 += wzz * g2; b6_2 += wxy * g2; b7_2 += wxz * g2; b8_2 += wyz * g2;
    }
  }
  Mp[0] = sxx; Mp[1] = sxy; Mp[2] = sxz; Mp[3] = 0.5 * txxx; Mp[4] = 0.5 * txyy; Mp[5] = 0.5 * txzz; Mp[6] = txxy; Mp[7] = txxz; Mp[8] = txyz;
  Mp[9] = syy; Mp[10] = syz; Mp[11] = 0.5 * txxy; Mp[12] = 0.5 * tyyy; Mp[13] = 0.5 * tyzz; Mp[14] = txyy; Mp[15] = txyz; Mp[16] = tyyz;
  Mp[17] = szz; Mp[18] = 0.5 * txxz; Mp[19] = 0.5 * tyyz; Mp[20] = 0.5 * tzzz; Mp[21] = txyz; Mp[22] = txzz; Mp[23] = tyzz;
  Mp[24] = 0.25 * qxxxx; Mp[25] = 0.25 * qxxyy; Mp[26] = 0.25 * qxxzz; Mp[27] = 0.5 * qxxxy; Mp[28] = 0.5 * qxxxz; Mp[29] = 0.5 * qxxyz;
  Mp[30] = 0.25 * qyyyy; Mp[31] = 0.25 * qyyzz; Mp[32] = 0.5 * qxyyy; Mp[33] = 0.5 * qxyyz; Mp[34] = 0.5 * qyyyz;
  Mp[35] = 0.25 * qzzzz; Mp[36] = 0.5 * qxyzz; Mp[37] = 0.5 * qxzzz; Mp[38] = 0.5 * qyzzz;
  Mp[39] = qxxyy; Mp[40] = qxxyz; Mp[41] = qxyyz;
  Mp[42] = qxxzz; Mp[43] = qxyzz;
  Mp[44] = qyyzz;
  B[0] = b0_0; B[1] = b1_0; B[2] = b2_0; B[3] = 0.5 * b3_0; B[4] = 0.5 * b4_0; B[5] = 0.5 * b5_0; B[6] = b6_0; B[7] = b7_0; B[8] = b8_0;
  if (three) {
    B[9] = b0_1; B[10] = b1_1; B[11] = b2_1; B[12] = 0.5 * b3_1; B[13] = 0.5 * b4_1; B[14] = 0.5 * b5_1; B[15] = b6_1; B[16] = b7_1; B[17] = b8_1;
    B[18] = b0_2; B[19] = b1_2; B[20] = b2_2; B[21] = 0.5 * b3_2; B[22] = 0.5 * b4_2; B[23] = 0.5 * b5_2; B[24] = b6_2; B[25] = b7_2; B[26] = b8_2;
  }
  return factorNine(Mp, Lp, inv, PIVOT_TOLERANCE);
}

/**
 * Chooses site `i`'s neighbours (its one-ring, or the two-ring when the one-ring is one-sided or
 * ill-conditioned), leaves them in `lastSite` and the factorised normal matrix in the module's scratch.
 * `mark` must differ between calls since the last `beginSites`. Returns the fit's smallest relative
 * pivot (0 when an unknown was dropped), or −1 when the site has no neighbour at all.
 */
export function fitSite(positions: Float64Array, stencil: Stencil, i: number, mark: number): number {
  const so = stencil.offsets, sid = stencil.ids;
  let ok = fitGeometry(positions, i, sid, so[i]!, so[i + 1]!, true);
  if (ok >= WIDEN_TOLERANCE) { lastSite.list = sid; lastSite.lo = so[i]!; lastSite.hi = so[i + 1]!; return ok; }
  const m = twoRing(so, sid, i, mark);
  ok = fitGeometry(positions, i, ringIds(), 0, m, false);
  lastSite.list = ringIds(); lastSite.lo = 0; lastSite.hi = m;
  return ok;
}

/**
 * Sums and factorises the normal matrix of the quadratic fit at site `i` over neighbours
 * `list[lo..hi-1]` (sets `lastSite.ih`). Returns the smallest relative pivot of the kept unknowns among
 * the gradient and curvature terms (1 = perfectly conditioned), 0 when an unknown was dropped, −1 when
 * there is no neighbour at all, SKEWED (without fitting) when `skipOneSided` and the ring is one-sided.
 */
function fitGeometry(positions: Float64Array, i: number, list: Int32Array, lo: number, hi: number, skipOneSided: boolean): number {
  const x0 = positions[3 * i]!, y0 = positions[3 * i + 1]!, z0 = positions[3 * i + 2]!;
  const n = hi - lo;
  if (X.length < n) { const m = Math.max(n, 2 * X.length); X = new Float64Array(m); Yo = new Float64Array(m); Z = new Float64Array(m); W = new Float64Array(m); }
  // one gather of the offsets; the moments and every right-hand side read them from the scratch
  let h2 = 0, used = 0, mx = 0, my = 0, mz = 0;
  for (let s = lo, t = 0; s < hi; s++, t++) {
    const q = 3 * list[s]!, dx = positions[q]! - x0, dy = positions[q + 1]! - y0, dz = positions[q + 2]! - z0;
    X[t] = dx; Yo[t] = dy; Z[t] = dz;
    const r2 = dx * dx + dy * dy + dz * dz;
    if (r2 > 0) { h2 += r2; used++; mx += dx; my += dy; mz += dz; }
  }
  if (used === 0) return -1;
  const ih = 1 / Math.sqrt(h2 / used);
  lastSite.ih = ih;
  if (skipOneSided && Math.hypot(mx, my, mz) / used * ih > ONE_SIDED) return SKEWED;
  // weighted moments Σ w x^a y^b z^c of degree 2 (s), 3 (t) and 4 (q) in scaled offsets
  let sxx = 0, syy = 0, szz = 0, sxy = 0, sxz = 0, syz = 0;
  let txxx = 0, txxy = 0, txxz = 0, txyy = 0, tyyy = 0, tyyz = 0, txzz = 0, tyzz = 0, tzzz = 0, txyz = 0;
  let qxxxx = 0, qyyyy = 0, qzzzz = 0, qxxxy = 0, qxxxz = 0, qxyyy = 0, qyyyz = 0, qxzzz = 0, qyzzz = 0;
  let qxxyy = 0, qxxzz = 0, qyyzz = 0, qxxyz = 0, qxyyz = 0, qxyzz = 0;
  for (let t = 0; t < n; t++) {
    const x = X[t]! * ih, y = Yo[t]! * ih, z = Z[t]! * ih;
    X[t] = x; Yo[t] = y; Z[t] = z;
    const r2 = x * x + y * y + z * z;
    if (!(r2 > 0)) { W[t] = 0; continue; }
    const w = 1 / r2;
    W[t] = w;
    const wx = w * x, wy = w * y, wz = w * z;
    const wxx = wx * x, wyy = wy * y, wzz = wz * z, wxy = wx * y;
    const xx = x * x, yy = y * y, zz = z * z, xy = x * y, xz = x * z, yz = y * z;
    sxx += wxx; syy += wyy; szz += wzz; sxy += wxy; sxz += wx * z; syz += wy * z;
    txxx += wxx * x; txxy += wxx * y; txxz += wxx * z; txyy += wyy * x; tyyy += wyy * y; tyyz += wyy * z;
    txzz += wzz * x; tyzz += wzz * y; tzzz += wzz * z; txyz += wxy * z;
    qxxxx += wxx * xx; qyyyy += wyy * yy; qzzzz += wzz * zz; qxxxy += wxx * xy; qxxxz += wxx * xz; qxyyy += wyy * xy;
    qyyyz += wyy * yz; qxzzz += wzz * xz; qyzzz += wzz * yz; qxxyy += wxx * yy; qxxzz += wxx * zz; qyyzz += wyy * zz;
    qxxyz += wxx * yz; qxyyz += wyy * xz; qxyzz += wzz * xy;
  }
  // the normal matrix of the unknowns (g_x, g_y, g_z, H_xx, H_yy, H_zz, H_xy, H_xz, H_yz), packed upper
  // triangle: entry (a, b) = Σ w m_a m_b with m = (x, y, z, ½x², ½y², ½z², xy, xz, yz)
  Mp[0] = sxx; Mp[1] = sxy; Mp[2] = sxz; Mp[3] = 0.5 * txxx; Mp[4] = 0.5 * txyy; Mp[5] = 0.5 * txzz; Mp[6] = txxy; Mp[7] = txxz; Mp[8] = txyz;
  Mp[9] = syy; Mp[10] = syz; Mp[11] = 0.5 * txxy; Mp[12] = 0.5 * tyyy; Mp[13] = 0.5 * tyzz; Mp[14] = txyy; Mp[15] = txyz; Mp[16] = tyyz;
  Mp[17] = szz; Mp[18] = 0.5 * txxz; Mp[19] = 0.5 * tyyz; Mp[20] = 0.5 * tzzz; Mp[21] = txyz; Mp[22] = txzz; Mp[23] = tyzz;
  Mp[24] = 0.25 * qxxxx; Mp[25] = 0.25 * qxxyy; Mp[26] = 0.25 * qxxzz; Mp[27] = 0.5 * qxxxy; Mp[28] = 0.5 * qxxxz; Mp[29] = 0.5 * qxxyz;
  Mp[30] = 0.25 * qyyyy; Mp[31] = 0.25 * qyyzz; Mp[32] = 0.5 * qxyyy; Mp[33] = 0.5 * qxyyz; Mp[34] = 0.5 * qyyyz;
  Mp[35] = 0.25 * qzzzz; Mp[36] = 0.5 * qxyzz; Mp[37] = 0.5 * qxzzz; Mp[38] = 0.5 * qyzzz;
  Mp[39] = qxxyy; Mp[40] = qxxyz; Mp[41] = qxyyz;
  Mp[42] = qxxzz; Mp[43] = qxyzz;
  Mp[44] = qyyzz;
  return factorNine(Mp, Lp, inv, PIVOT_TOLERANCE);
}

/**
 * After `fitSite(…, i, …)`: sums the right-hand sides Σ w m_a Δf over `lastSite`'s neighbours for the
 * `nc` components of `values` and solves; leaves the gradient (field unit per length unit) in `Y[9c + 0..2]`.
 */
function solveSite(values: NumericArray, nc: number, i: number): void {
  const { list, lo, hi, ih } = lastSite;
  let b0_0 = 0, b1_0 = 0, b2_0 = 0, b3_0 = 0, b4_0 = 0, b5_0 = 0, b6_0 = 0, b7_0 = 0, b8_0 = 0;
  let b0_1 = 0, b1_1 = 0, b2_1 = 0, b3_1 = 0, b4_1 = 0, b5_1 = 0, b6_1 = 0, b7_1 = 0, b8_1 = 0;
  let b0_2 = 0, b1_2 = 0, b2_2 = 0, b3_2 = 0, b4_2 = 0, b5_2 = 0, b6_2 = 0, b7_2 = 0, b8_2 = 0;
  const wide = nc !== 1 && nc !== 3;
  if (wide) B.fill(0, 0, 9 * nc);
  const f0 = values[i * nc]!, f1 = nc > 1 ? values[i * nc + 1]! : 0, f2 = nc > 2 ? values[i * nc + 2]! : 0;
  // the scaled offsets and weights of the fit just made (fitGeometry's scratch), in list order
  for (let s = lo, t = 0; s < hi; s++, t++) {
    const w = W[t]!;
    if (w === 0) continue;
    const j = list[s]!, x = X[t]!, y = Yo[t]!, z = Z[t]!;
    const wx = w * x, wy = w * y, wz = w * z;
    const wxx = wx * x, wyy = wy * y, wzz = wz * z, wxy = wx * y, wxz = wx * z, wyz = wy * z;
    const g0 = values[j * nc]! - f0;
    b0_0 += wx * g0; b1_0 += wy * g0; b2_0 += wz * g0; b3_0 += wxx * g0; b4_0 += wyy * g0; b5_0 += wzz * g0; b6_0 += wxy * g0; b7_0 += wxz * g0; b8_0 += wyz * g0;
    if (nc === 3) {
      const g1 = values[j * nc + 1]! - f1, g2 = values[j * nc + 2]! - f2;
      b0_1 += wx * g1; b1_1 += wy * g1; b2_1 += wz * g1; b3_1 += wxx * g1; b4_1 += wyy * g1; b5_1 += wzz * g1; b6_1 += wxy * g1; b7_1 += wxz * g1; b8_1 += wyz * g1;
      b0_2 += wx * g2; b1_2 += wy * g2; b2_2 += wz * g2; b3_2 += wxx * g2; b4_2 += wyy * g2; b5_2 += wzz * g2; b6_2 += wxy * g2; b7_2 += wxz * g2; b8_2 += wyz * g2;
    } else if (wide) {
      for (let c = 1; c < nc; c++) {
        const g = values[j * nc + c]! - values[i * nc + c]!, o = 9 * c;
        B[o]! += wx * g; B[o + 1]! += wy * g; B[o + 2]! += wz * g; B[o + 3]! += wxx * g; B[o + 4]! += wyy * g; B[o + 5]! += wzz * g;
        B[o + 6]! += wxy * g; B[o + 7]! += wxz * g; B[o + 8]! += wyz * g;
      }
    }
  }
  // the ½ of the square terms' monomials, applied once after the sums
  B[0] = b0_0; B[1] = b1_0; B[2] = b2_0; B[3] = 0.5 * b3_0; B[4] = 0.5 * b4_0; B[5] = 0.5 * b5_0; B[6] = b6_0; B[7] = b7_0; B[8] = b8_0;
  if (nc === 3) {
    B[9] = b0_1; B[10] = b1_1; B[11] = b2_1; B[12] = 0.5 * b3_1; B[13] = 0.5 * b4_1; B[14] = 0.5 * b5_1; B[15] = b6_1; B[16] = b7_1; B[17] = b8_1;
    B[18] = b0_2; B[19] = b1_2; B[20] = b2_2; B[21] = 0.5 * b3_2; B[22] = 0.5 * b4_2; B[23] = 0.5 * b5_2; B[24] = b6_2; B[25] = b7_2; B[26] = b8_2;
  } else if (wide) {
    for (let c = 1; c < nc; c++) { B[9 * c + 3]! *= 0.5; B[9 * c + 4]! *= 0.5; B[9 * c + 5]! *= 0.5; }
  }
  for (let c = 0; c < nc; c++) {
    const o = 9 * c;
    gradientNine(Lp, inv, B, Y, o);
    Y[o]! *= ih; Y[o + 1]! *= ih; Y[o + 2]! *= ih;
  }
}

/**
 * After `fitSite(…, i, …)` (and before the next fit): the gradient's weights of `lastSite`'s neighbours, so that for any field
 * ∂f/∂x_k at site i = Σ_s c[3s + k]·(f(list[s]) − f(i)) (per length unit). Writes 3 values per neighbour
 * to `c` from `at` on (`hi − lo` neighbours, in list order).
 */
export function siteWeights(c: Float64Array, at: number): void {
  const { lo, hi, ih } = lastSite;
  // rows 0 … 2 of the (pivot-dropping) inverse: the solve applied to each unit right-hand side
  for (let l = 0; l < 9; l++) { B.fill(0, 0, 9); B[l] = 1; gradientNine(Lp, inv, B, Y, 0); R[l] = Y[0]!; R[9 + l] = Y[1]!; R[18 + l] = Y[2]!; }
  for (let t = 0, o = at; t < hi - lo; t++, o += 3) {
    const w = W[t]!, x = X[t]!, y = Yo[t]!, z = Z[t]!;
    if (w === 0) { c[o] = 0; c[o + 1] = 0; c[o + 2] = 0; continue; }
    const m0 = w * x, m1 = w * y, m2 = w * z, m3 = 0.5 * m0 * x, m4 = 0.5 * m1 * y, m5 = 0.5 * m2 * z, m6 = m0 * y, m7 = m0 * z, m8 = m1 * z;
    for (let k = 0; k < 3; k++) {
      const r = 9 * k;
      c[o + k] = ih * (R[r]! * m0 + R[r + 1]! * m1 + R[r + 2]! * m2 + R[r + 3]! * m3 + R[r + 4]! * m4 + R[r + 5]! * m5
        + R[r + 6]! * m6 + R[r + 7]! * m7 + R[r + 8]! * m8);
    }
  }
}
const R = new Float64Array(27);
