/**
 * Grid-convergence estimate from three meshes of one case, following Celik et al. (2008),
 * "Procedure for estimation and reporting of uncertainty due to discretization in CFD applications",
 * J. Fluids Eng. 130(7), 078001: apparent order p by fixed-point iteration, Richardson-extrapolated
 * value, approximate and extrapolated relative errors, and the fine-grid convergence index with a
 * safety factor of 1.25 (three or more grids; Roache 1997/2011).
 *
 * Convergence is classified by the ratio R = ε21/ε32 (ε21 = φ2 − φ1, ε32 = φ3 − φ2; 1 fine, 3 coarse):
 * 0 < R < 1 monotonic convergence; −1 < R < 0 oscillatory convergence; |R| ≥ 1 divergence;
 * values equal to within `ROUNDING_SPREAD` already converged. Only monotonic convergence yields an order, an extrapolated value
 * and a GCI; the other cases are reported as such with those numbers left null, never forced.
 */

/**
 * Relative spread below which three values count as equal. Integrals over different meshes of a field the
 * meshes represent exactly agree only to rounding (about 1e-13 relative); read as data, that noise would
 * look like an oscillation or a divergence.
 */
export const ROUNDING_SPREAD = 1e-10;

/** Safety factor for three or more grids (Roache). */
export const GCI_SAFETY_FACTOR = 1.25;

export type ConvergenceKind = 'monotonic' | 'oscillatory' | 'divergent' | 'converged' | 'no-order';

/** One quantity on three meshes. h: representative cell size of each mesh (any consistent length unit). */
export interface GciInput {
  /** Cell sizes, fine → coarse: h1 < h2 < h3. */
  h: [number, number, number];
  /** The quantity on the fine, medium and coarse meshes: φ1, φ2, φ3. */
  phi: [number, number, number];
}

export interface GciResult {
  kind: ConvergenceKind;
  /** r21 = h2/h1, r32 = h3/h2. */
  r21: number;
  r32: number;
  /** R = ε21/ε32 (null when ε32 = 0). */
  ratio: number | null;
  /** Apparent order p (null unless monotonic). */
  order: number | null;
  /** Extrapolated value φ_ext21 (same unit as φ). */
  extrapolated: number | null;
  /** Approximate relative error e_a21 = |(φ1 − φ2)/φ1| (fraction, not percent). */
  approxRelError: number | null;
  /** Extrapolated relative error e_ext21 = |(φ_ext − φ1)/φ_ext| (fraction). */
  extrapRelError: number | null;
  /** Fine-grid convergence index GCI21 = 1.25 e_a21/(r21^p − 1) (fraction). */
  gciFine: number | null;
  /** Medium-grid index GCI32 = 1.25 e_a32/(r32^p − 1) (fraction). */
  gciMedium: number | null;
  /** GCI32 / (r21^p · GCI21): near 1 in the asymptotic range. */
  asymptoticRatio: number | null;
  /** Why numbers are missing, or warnings such as a refinement ratio below 1.3. */
  notes: string[];
}

/** Representative cell size of a 3D mesh: h = (total volume / cells)^(1/3) (Celik et al. 2008, Eq. 1). */
export function meshSize3D(totalVolume: number, cells: number): number {
  return Math.cbrt(totalVolume / cells);
}

/** Representative cell size of a 2D mesh: h = (total area / cells)^(1/2). */
export function meshSize2D(totalArea: number, cells: number): number {
  return Math.sqrt(totalArea / cells);
}

/** Solves p = |ln|ε32/ε21| + q(p)| / ln r21, q(p) = ln((r21^p − s)/(r32^p − s)), by fixed-point iteration. */
function apparentOrder(r21: number, r32: number, e21: number, e32: number, s: number): number | null {
  const lnRatio = Math.log(Math.abs(e32 / e21));
  let p = Math.abs(lnRatio) / Math.log(r21);
  for (let it = 0; it < 500; it++) {
    const q = Math.log((r21 ** p - s) / (r32 ** p - s));
    const next = Math.abs(lnRatio + q) / Math.log(r21);
    if (!Number.isFinite(next)) return null;
    if (Math.abs(next - p) <= 1e-14 * Math.max(1, next)) return next;
    p = next;
  }
  return null;
}

/** The grid-convergence estimate of one quantity. Throws if the sizes are not ordered fine → coarse. */
export function gridConvergence(input: GciInput): GciResult {
  const [h1, h2, h3] = input.h;
  const [f1, f2, f3] = input.phi;
  if (!(h1 > 0 && h2 > h1 && h3 > h2)) throw new Error(`gci: cell sizes must grow from fine to coarse (h1 < h2 < h3), got ${h1}, ${h2}, ${h3}`);
  if (![f1, f2, f3].every(Number.isFinite)) throw new Error(`gci: values must be finite numbers, got ${f1}, ${f2}, ${f3}`);
  const r21 = h2 / h1, r32 = h3 / h2;
  const e21 = f2 - f1, e32 = f3 - f2;
  const notes: string[] = [];
  if (r21 < 1.3 || r32 < 1.3) notes.push(`refinement ratio ${Math.min(r21, r32).toFixed(3)} is below 1.3, the value Celik et al. recommend as a minimum`);
  const empty = { order: null, extrapolated: null, approxRelError: null, extrapRelError: null, gciFine: null, gciMedium: null, asymptoticRatio: null };
  const scale = Math.max(Math.abs(f1), Math.abs(f2), Math.abs(f3), Number.MIN_VALUE);
  if (Math.max(f1, f2, f3) - Math.min(f1, f2, f3) <= ROUNDING_SPREAD * scale) {
    return { kind: 'converged', r21, r32, ratio: null, ...empty, notes: [...notes, `the three values agree to ${ROUNDING_SPREAD} relative: the quantity does not change with the mesh (the differences are rounding); no order can be estimated`] };
  }
  if (e32 === 0) return { kind: 'divergent', r21, r32, ratio: null, ...empty, notes: [...notes, 'coarse and medium values are equal while the fine one differs'] };
  const ratio = e21 / e32;
  if (ratio < 0) {
    return { kind: 'oscillatory', r21, r32, ratio, ...empty, notes: [...notes, `oscillatory convergence (R = ε21/ε32 = ${ratio.toPrecision(4)} < 0): the solution swings between meshes; no order or GCI is reported`] };
  }
  if (ratio >= 1) {
    return { kind: 'divergent', r21, r32, ratio, ...empty, notes: [...notes, `the differences grow with refinement (R = ε21/ε32 = ${ratio.toPrecision(4)} ≥ 1): not converging; no order or GCI is reported`] };
  }
  if (e21 === 0) {
    return { kind: 'converged', r21, r32, ratio, ...empty, notes: [...notes, 'fine and medium values are equal: no order can be estimated'] };
  }
  const p = apparentOrder(r21, r32, e21, e32, 1);
  if (p === null || p === 0) return { kind: 'no-order', r21, r32, ratio, ...empty, notes: [...notes, 'the fixed-point iteration for the apparent order did not converge'] };
  const r21p = r21 ** p, r32p = r32 ** p;
  const extrapolated = (r21p * f1 - f2) / (r21p - 1);
  const approxRelError = Math.abs((f1 - f2) / f1);
  const extrapRelError = Math.abs((extrapolated - f1) / extrapolated);
  const gciFine = (GCI_SAFETY_FACTOR * approxRelError) / (r21p - 1);
  const gciMedium = (GCI_SAFETY_FACTOR * Math.abs((f2 - f3) / f2)) / (r32p - 1);
  return {
    kind: 'monotonic', r21, r32, ratio, order: p, extrapolated, approxRelError, extrapRelError, gciFine, gciMedium,
    asymptoticRatio: gciMedium / (r21p * gciFine), notes,
  };
}
