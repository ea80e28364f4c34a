/**
 * A prepared gradient: the quadratic least-squares fit of quadraticGradient.ts reduced, once per mesh and
 * set of sites, to weights on each site's neighbours, so that
 *
 *   ∂f/∂x_k (site i) = Σ_s c_{i,s,k} · (f(n_s) − f(i))     (per length unit)
 *
 * for any field f on those sites — the fit is linear in the values, and its normal matrix depends on the
 * geometry only. Preparing costs about one direct fit; each field after that costs 9 multiply-adds per
 * neighbour for a vector (a few times less than a fit). Used where the same sites are asked again with new
 * values: the wall nodes of a series' time steps on one mesh, or the velocity and then the pressure.
 *
 * Memory: 28 bytes per neighbour entry (3 weights and an index); a wall node's one-sided fit uses its
 * two-ring, 40–80 neighbours. `prepareGradient` gives up (returns null) past `budgetBytes`. Writing the
 * weights touches that much fresh memory, which costs about as much as another direct fit, so callers
 * prepare on the third request in a row for the same sites (fieldGradient.ts, PREPARE_AFTER).
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { beginSites, fitSite, lastSite, siteWeights } from './quadraticGradient.ts';
import type { Stencil } from './stencils.ts';

/** Weights of the fit at chosen sites (CSR over the targets). */
export interface PreparedGradient {
  /** The sites, in the order of the results. */
  readonly targets: Int32Array;
  /** Entries of target t: `offsets[t] .. offsets[t+1]-1`. */
  readonly offsets: Int32Array;
  /** Neighbour site of each entry. */
  readonly ids: Int32Array;
  /** 3 weights per entry (per length unit). */
  readonly weights: Float64Array;
  /** 1 where the site has no neighbour (its gradient is NaN). */
  readonly missing: Uint8Array;
  /** Bytes held by the arrays above. */
  readonly bytes: number;
}

/** Default memory limit of one prepared gradient (bytes). */
export const PREPARED_GRADIENT_BUDGET = 256 * 2 ** 20;

/**
 * Weights of the fit at `targets` (site ids into `positions`, xyz per site) over `stencil` (one-rings).
 * `ringSizes[t]` is the number of neighbours target t's fit uses (from a direct pass, `gradientInto`), so
 * the arrays are allocated once at their final size. Returns null when they would pass `budgetBytes`.
 */
export function prepareGradient(positions: Float64Array, stencil: Stencil, targets: Int32Array, ringSizes: Int32Array,
  budgetBytes = PREPARED_GRADIENT_BUDGET): PreparedGradient | null {
  const n = targets.length, offsets = new Int32Array(n + 1), missing = new Uint8Array(n);
  for (let t = 0; t < n; t++) offsets[t + 1] = offsets[t]! + ringSizes[t]!;
  const total = offsets[n]!;
  if (28 * total > budgetBytes) return null;
  const ids = new Int32Array(total), weights = new Float64Array(3 * total);
  beginSites(positions.length / 3);
  for (let t = 0; t < n; t++) {
    const i = targets[t]!, o = offsets[t]!;
    if (fitSite(positions, stencil, i, t) < 0) { missing[t] = 1; continue; }
    const { list, lo, hi } = lastSite;
    if (hi - lo !== offsets[t + 1]! - o) throw new Error(`prepared gradient: site ${i} now fits over ${hi - lo} neighbours, the direct pass said ${offsets[t + 1]! - o}`);
    for (let s = lo, q = o; s < hi; s++, q++) ids[q] = list[s]!;
    siteWeights(positions, i, weights, 3 * o);
  }
  return { targets: targets.slice(), offsets, ids, weights, missing, bytes: 4 * (n + 1) + n + ids.byteLength + weights.byteLength };
}

/**
 * Gradients of a field with `nc` components per site (`values`, over the same sites as the positions the
 * weights came from) at the prepared targets: `targets.length · nc · 3` values, target t's component c,
 * direction k at `(t·nc + c)·3 + k` (field unit per length unit), as `quadraticGradient`.
 */
export function applyGradient(g: PreparedGradient, values: NumericArray, nc: number): Float64Array {
  const n = g.targets.length, out = new Float64Array(3 * nc * n);
  const off = g.offsets, ids = g.ids, w = g.weights, tg = g.targets;
  for (let t = 0; t < n; t++) {
    const ob = 3 * nc * t;
    if (g.missing[t]) { out.fill(NaN, ob, ob + 3 * nc); continue; }
    const i = tg[t]!, a = off[t]!, b = off[t + 1]!;
    if (nc === 3) {
      const u0 = values[3 * i]!, v0 = values[3 * i + 1]!, w0 = values[3 * i + 2]!;
      let uX = 0, uY = 0, uZ = 0, vX = 0, vY = 0, vZ = 0, wX = 0, wY = 0, wZ = 0;
      for (let s = a; s < b; s++) {
        const q = 3 * ids[s]!, cx = w[3 * s]!, cy = w[3 * s + 1]!, cz = w[3 * s + 2]!;
        const du = values[q]! - u0, dv = values[q + 1]! - v0, dw = values[q + 2]! - w0;
        uX += cx * du; uY += cy * du; uZ += cz * du;
        vX += cx * dv; vY += cy * dv; vZ += cz * dv;
        wX += cx * dw; wY += cy * dw; wZ += cz * dw;
      }
      out[ob] = uX; out[ob + 1] = uY; out[ob + 2] = uZ; out[ob + 3] = vX; out[ob + 4] = vY; out[ob + 5] = vZ;
      out[ob + 6] = wX; out[ob + 7] = wY; out[ob + 8] = wZ;
      continue;
    }
    for (let c = 0; c < nc; c++) {
      const f0 = values[nc * i + c]!;
      let gx = 0, gy = 0, gz = 0;
      for (let s = a; s < b; s++) {
        const d = values[nc * ids[s]! + c]! - f0;
        gx += w[3 * s]! * d; gy += w[3 * s + 1]! * d; gz += w[3 * s + 2]! * d;
      }
      out[ob + 3 * c] = gx; out[ob + 3 * c + 1] = gy; out[ob + 3 * c + 2] = gz;
    }
  }
  return out;
}
