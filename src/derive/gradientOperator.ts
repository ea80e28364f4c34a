/**
 * The quadratic least-squares gradient of `quadraticGradient.ts` written as a linear operator, for sites
 * whose gradient is wanted again and again on the same mesh (the wall nodes of a force total over every
 * step of a series). The fit depends on the values only through the right-hand side: at site i,
 *
 *     ∇f(x_i) ≈ Σ_j c_ij (f_j − f_i),   c_ij = (1/h) · rows 0..2 of P · (w_j a_j),
 *
 * with a_j the nine scaled monomials of the offset d_j/h, w_j = 1/|d_j/h|² and P the (pivot-dropping)
 * inverse of the normal-equation matrix — all geometry. The kernel itself chooses each site's neighbours,
 * scale and dropped unknowns (`fitSite`) and turns its factor into these weights (`siteWeights`), once,
 * here; each later gradient costs three multiply-adds per neighbour and component. Results equal the kernel's to rounding
 * (tests/derive/gradientOperator.test.ts); the method is Barth & Frederickson (1990), see that file.
 *
 * Layout: target k's neighbours are `ids[offsets[k] .. offsets[k+1]-1]` (site indices), their coefficients
 * `coef[3·e + j]` for direction j (1 / length unit). A target with no neighbour at all has `offsets[k] ===
 * offsets[k+1]` and `empty[k] = 1`, and gets NaN, as from the kernel.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { beginSites, fitSite, lastSite, siteWeights } from './quadraticGradient.ts';
import type { Stencil } from './stencils.ts';

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

/**
 * Builds the operator at `targets` over `positions` (xyz per site, length unit) with `stencil` each site's
 * one-ring: the kernel's own fit of each target (see the file comment).
 */
export function gradientOperator(positions: Float64Array, stencil: Stencil, targets: Int32Array): GradientOperator {
  const offsets = new Int32Array(targets.length + 1), empty = new Uint8Array(targets.length);
  let ids = new Int32Array(Math.max(64, 32 * targets.length)), coef = new Float64Array(3 * ids.length);
  let e = 0;
  beginSites(positions.length / 3);
  for (let k = 0; k < targets.length; k++) {
    const i = targets[k]!;
    if (fitSite(positions, stencil, i, k) < 0) { empty[k] = 1; offsets[k + 1] = e; continue; }
    const { list, lo, hi } = lastSite, n = hi - lo;
    if (e + n > ids.length) {
      const size = Math.max(2 * ids.length, e + n), gi = new Int32Array(size), gc = new Float64Array(3 * size);
      gi.set(ids.subarray(0, e)); gc.set(coef.subarray(0, 3 * e)); ids = gi; coef = gc;
    }
    siteWeights(coef, 3 * e);
    ids.set(list.subarray(lo, hi), e);
    e += n;
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
