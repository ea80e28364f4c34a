/**
 * Surface integrals over a triangle set (a cut, a region of it, or a boundary-surface group): area,
 * centroid, volume-flow rate Q = ∫u·n dA, mass-flow rate ṁ = ∫ρ u·n dA, area-weighted and
 * mass-flow-weighted means of every field, total pressure, min/max, flow-uniformity index and reverse flow.
 *
 * Conventions (repeated in every report):
 *  - n is each triangle's unit normal by its winding ((b − a) × (c − a)); for a cut, the plane normal.
 *    Fluxes are positive along n.
 *  - Point fields are linear over each triangle, cell fields constant. Every integral of a product of up to
 *    three such fields (ρ · u·n · φ) uses the degree-3 rule `TRI7`, so it is exact to rounding; on a field
 *    linear over each cell the mass-flow-weighted mean of a quadratic quantity (|u|² with constant ρ) is exact.
 *  - Magnitudes |v| are not polynomial: they are evaluated at the rule's points from the interpolated
 *    components (the magnitude of the interpolated vector, not an interpolated magnitude).
 *  - Total pressure p₀ = p + ½ρ|u|² (kinematic files, p/ρ stored: p₀/ρ = p/ρ + ½|u|², reported in that form).
 *    With ρ a field, ρ²·u·n·|u|² is of degree 5 and the rule is not exact for it.
 *  - Min/max are over the vertices (exact for the linear interpolants of components; for magnitudes the max
 *    is exact, the min is the least vertex value) and over the arc quadrature points of a disk region.
 *  - Reverse flow (u·n < 0) and ∫|u·n − ū_n| dA split each triangle exactly along the line where the linear
 *    u·n crosses the threshold; on the arc pieces of a disk region they go by the sign at each quadrature point.
 *  - Uniformity index, common practice: γ = 1 − Σ|u_n,i − ū_n|A_i / (2|ū_n|A), here in its continuous form
 *    with ū_n = Q/A.
 * An empty surface (or one of zero area) gives `empty: true` and null numbers — never zeros as if measured.
 */
import { TRI7 } from './quadrature.ts';
import { guessRole, pickField, type FieldInfo } from './fieldRoles.ts';
import { triangleCount, type SurfaceField, type TriangleSet } from './triangleSet.ts';

/** Extra quadrature points with field values (the curved pieces of a disk region; see `regionClip.ts`). */
export interface ArcCloud {
  /** xyz per point. */
  readonly positions: Float64Array;
  /** Area weight per point (length unit squared). */
  readonly weights: Float64Array;
  /** Unit normal shared by every point. */
  readonly normal: readonly [number, number, number];
  /** Values per point, one array per field of the triangle set, in the set's field order (tuple-interleaved). */
  readonly values: readonly Float64Array[];
}

/** Options of `integrateSurface`; every field optional. */
export interface IntegralOptions {
  /** Velocity field (`name`, `point:name` or `cell:name`), null for none. Default (undefined): by the rule of `fieldRoles.ts`. */
  velocity: string | null | undefined;
  /** Pressure field, as `velocity`. Default: by the rule. */
  pressure: string | null | undefined;
  /** Density: a constant (mass per length cubed, file's units) or a field spec; null for none. Default: a field by the rule, else none. */
  density: number | string | null | undefined;
  /** The pressure field holds p/ρ (kinematic): total pressure is reported as p₀/ρ = p/ρ + ½|u|². Default false. */
  kinematicPressure: boolean;
}

export type Stat = number | number[];

export interface SurfaceIntegrals {
  empty: boolean;
  /** Why the result is empty, or null. */
  reason: string | null;
  triangles: number;
  area: number | null;
  centroid: [number, number, number] | null;
  /** Unit area-weighted mean normal (for a planar cut, the plane's normal). */
  normal: [number, number, number] | null;
  volumeFlowRate: number | null;
  massFlowRate: number | null;
  /** ∫φ dA of every field (vectors per component). */
  integral: Record<string, Stat>;
  areaMean: Record<string, Stat>;
  massFlowMean: Record<string, Stat>;
  /** Means of |v| of every vector field. */
  magnitudeAreaMean: Record<string, number>;
  magnitudeMassFlowMean: Record<string, number>;
  min: Record<string, Stat>;
  max: Record<string, Stat>;
  magnitudeMin: Record<string, number>;
  magnitudeMax: Record<string, number>;
  /** Means of the pressure field (as stored: p, or p/ρ when kinematic), or null without one. */
  staticPressure: { areaMean: number; massFlowMean: number | null; kinematic: boolean } | null;
  totalPressure: { areaMean: number | null; massFlowMean: number | null; kinematic: boolean } | null;
  uniformityIndex: number | null;
  reverseFlow: { area: number; areaShare: number; volumeFlowRate: number; massFlowRate: number | null; massShare: number | null } | null;
  /** The fields and density used, as `name (association)` or a number. */
  roles: { velocity: string | null; pressure: string | null; density: string | number | null; kinematicPressure: boolean };
  notes: string[];
}

// ---- scratch ------------------------------------------------------------------------------------------
let vv = new Float64Array(96);   // vertex values: channel ch, vertex j at vv[3ch + j]
let triUn = new Float64Array(0), triArea = new Float64Array(0); // per triangle: u·n at the vertices, area
let triRho = new Float64Array(0); // per triangle: density at the vertices
let e7 = new Float64Array(64);   // channel ch at rule point q: e7[7ch + q]
const wmq = new Float64Array(7); // mass weight ρu_n·w at each rule point
let pv = new Float64Array(32);   // values at one quadrature point
let acc = new Float64Array(64);  // per channel: ∫φ dA, then ∫ρu_nφ dA
const sub = new Float64Array(12); // barycentric vertices of a clipped sub-polygon (≤ 4)

/** Key of a field in result records: its name, with " (cell)" when a point field has the same name. */
function keyOf(fields: readonly SurfaceField[], f: SurfaceField): string {
  return f.association === 'cell' && fields.some((g) => g.association === 'point' && g.name === f.name) ? `${f.name} (cell)` : f.name;
}

function resolve(set: TriangleSet, spec: string | null | undefined, role: 'velocity' | 'pressure' | 'density', notes: string[]): number {
  const infos: FieldInfo[] = set.fields.map((f) => ({ name: f.name, association: f.association, components: f.components }));
  let info: FieldInfo | null;
  if (spec === null) return -1;
  if (spec === undefined) {
    const g = guessRole(infos, role);
    info = g.field;
    if (!info && g.candidates.length > 1) notes.push(`${role}: several fields qualify (${g.candidates.join(', ')}); name one`);
  } else {
    info = pickField(infos, spec, role);
  }
  if (!info) return -1;
  const want = role === 'velocity' ? 3 : 1;
  if (info.components !== want) throw new Error(`${role}: field "${info.name}" has ${info.components} components, expected ${want}`);
  return set.fields.findIndex((f) => f.name === info!.name && f.association === info!.association);
}

/**
 * Triangles per block of the triangle pass. Sums run block by block, each block from zero in triangle order,
 * and the block sums are added in block order (the first block's sums are the start), so a pool's workers can
 * sum whole blocks of the merged cut and give the one-thread bits (`placeCuts.ts`); the blocks depend only on
 * the triangle count. A set of at most one block is summed in one pass, as before blocks.
 */
export const SUM_BLOCK = 4096;

/** What `integrateSurface` resolves from the set's fields and the options before summing: roles and channels. */
export interface SumLayout {
  readonly iu: number; readonly ip: number; readonly ir: number;
  readonly rhoConst: number | null; readonly kinematic: boolean; readonly hasRho: boolean;
  readonly roles: SurfaceIntegrals['roles']; readonly notes: string[];
  readonly chOf: Int32Array; readonly C: number; readonly vecs: number[];
  readonly magCh: Int32Array; readonly magNc: Int32Array; readonly needCh: Int32Array;
  readonly uCh: number; readonly pCh: number; readonly rCh: number; readonly rho0: number; readonly halfRho: number;
  /** The pressure channel when total pressure is reported (velocity, pressure and ρ or kinematic pressure), else −1: its sums are skipped. */
  readonly p0Ch: number;
  /** Numbers per block of `blockSums`: the 14 sums of the triangle pass, then ∫φ, ∫ρu_nφ and the magnitudes' sums. */
  readonly K: number;
}

/** Resolves roles and channels of `fields` under `options` (throws, naming the field, on a wrong role). */
export function sumLayout(fields: readonly { name: string; association: 'point' | 'cell'; components: number }[], options: Partial<IntegralOptions> = {}): SumLayout {
  const notes: string[] = [];
  const set = { fields } as unknown as TriangleSet;
  const iu = resolve(set, options.velocity, 'velocity', notes);
  const ip = resolve(set, options.pressure, 'pressure', notes);
  const rhoConst = typeof options.density === 'number' ? options.density : null;
  if (rhoConst !== null && !(Number.isFinite(rhoConst) && rhoConst > 0)) throw new Error(`density: expected a positive number, got ${rhoConst}`);
  const ir = rhoConst !== null ? -1 : resolve(set, options.density as string | null | undefined, 'density', notes);
  const kinematic = options.kinematicPressure ?? false;
  const hasRho = rhoConst !== null || ir >= 0;
  const label = (i: number) => (i < 0 ? null : `${fields[i]!.name} (${fields[i]!.association})`);
  const roles = { velocity: label(iu), pressure: label(ip), density: rhoConst ?? label(ir), kinematicPressure: kinematic };
  // Channels: every component of every field, in field order.
  const chOf = new Int32Array(fields.length + 1);
  for (let i = 0; i < fields.length; i++) chOf[i + 1] = chOf[i]! + fields[i]!.components;
  const C = chOf[fields.length]!;
  const vecs = fields.map((f, i) => (f.components > 1 ? i : -1)).filter((i) => i >= 0);
  const magCh = Int32Array.from(vecs, (i) => chOf[i]!), magNc = Int32Array.from(vecs, (i) => fields[i]!.components);
  const uCh = iu >= 0 ? chOf[iu]! : -1, pCh = ip >= 0 ? chOf[ip]! : -1, rCh = ir >= 0 ? chOf[ir]! : -1;
  // Total pressure is reported only with ρ (or kinematic pressure); without, its sums would be thrown away.
  const withP0 = pCh >= 0 && uCh >= 0 && (hasRho || kinematic);
  // Channels needed at the rule's points (`e7`): vector fields other than 3-vectors (magnitudes; a 3-vector's are
  // taken from its vertex values in the triangle pass), and velocity, pressure, density for p₀.
  const need = new Set<number>();
  vecs.forEach((i) => { if (fields[i]!.components !== 3) for (let c = 0; c < fields[i]!.components; c++) need.add(chOf[i]! + c); });
  if (withP0) { for (let c = 0; c < 3; c++) need.add(uCh + c); need.add(pCh); if (rCh >= 0) need.add(rCh); }
  return {
    iu, ip, ir, rhoConst, kinematic, hasRho, roles, notes, chOf, C, vecs, magCh, magNc, needCh: Int32Array.from(need),
    uCh, pCh, rCh, rho0: rhoConst ?? 1, halfRho: kinematic ? 0 : 1, p0Ch: withP0 ? pCh : -1, K: N_SUMS + 2 * C + 2 * vecs.length,
  };
}

/** Per-triangle results of the triangle pass (u·n and density at the vertices, area), read by the reverse-flow and deviation passes. */
export interface TriangleScratch { un: Float64Array; rho: Float64Array; area: Float64Array }

/**
 * Sums of blocks `b0 … b1 − 1` (`SUM_BLOCK` triangles each, the last one short) of a set whose first triangle
 * is triangle `first` of the set the blocks count in (a pool worker's share of a merged cut; 0 otherwise):
 * `K` numbers a block into `out` from `K·b`, and each triangle's u·n, density and area into `tri` at its
 * place in the whole set. Same arithmetic and order as `integrateSurface`.
 */
export function blockSums(set: TriangleSet, L: SumLayout, first: number, total: number, b0: number, b1: number, tri: TriangleScratch, out: Float64Array): void {
  const values = set.fields.map((f) => f.values), perVertex = Uint8Array.from(set.fields, (f) => (f.association === 'point' ? 1 : 0));
  const nAcc = L.K - N_SUMS;
  if (vv.length < 3 * L.C) vv = new Float64Array(3 * L.C);
  if (e7.length < 7 * L.C) e7 = new Float64Array(7 * L.C);
  if (acc.length < nAcc) acc = new Float64Array(nAcc);
  for (let b = b0; b < b1; b++) {
    const g0 = b * SUM_BLOCK, g1 = Math.min(total, g0 + SUM_BLOCK);
    sums.fill(0); acc.fill(0);
    // In short runs: the engine optimises the whole function (with feedback for every line of it, the end
    // included) after the first few runs instead of entering a half-fed optimised loop mid-way and throwing it
    // away at the loop's exit, which made the first two integrals of a session several times slower.
    // The running sums go in and out through `sums`, so the order of additions is that of one pass.
    for (let t0 = g0; t0 < g1; t0 += TRIANGLE_RUN) {
      triangleSums(set.positions, set.indices, values, perVertex, L.chOf, L.C, L.uCh, L.p0Ch, L.rCh, L.rho0, L.halfRho, L.needCh, L.magCh, L.magNc,
        t0 - first, Math.min(g1, t0 + TRIANGLE_RUN) - first, first, tri.un, tri.rho, tri.area);
    }
    if (L.uCh >= 0) { reverseFlowSums(g0, g1, tri); sums[S_ANEG] = revArea; sums[S_QNEG] = revFlow; sums[S_MNEG] = revMass; }
    out.set(sums, L.K * b);
    out.set(acc.subarray(0, nAcc), L.K * b + N_SUMS);
  }
}

/** Blocks summed elsewhere (a pool's workers): `done[b]` is 1 where `sums` holds block b, and `tri` holds its triangles' values. */
export interface SummedBlocks { sums: Float64Array; done: Uint8Array; tri: TriangleScratch }

/**
 * Integrates over `set` (and the optional arc points of a disk region). Units: those of the file. `summed`:
 * blocks of this very set already summed (by `blockSums`, in a pool's workers); the others are summed here.
 */
export function integrateSurface(set: TriangleSet, options: Partial<IntegralOptions> = {}, arcs?: ArcCloud, summed?: SummedBlocks): SurfaceIntegrals {
  const fields = set.fields;
  const L = sumLayout(fields, options);
  const { notes, roles, kinematic, hasRho, chOf, C, vecs, magCh, magNc, uCh, pCh, rCh, rho0, halfRho } = L;
  const nMag = vecs.length;
  const withP0 = L.p0Ch >= 0;
  // acc layout: [0,C) ∫φ, [C,2C) ∫ρu_nφ, then per vector: ∫|v|, ∫ρu_n|v|.
  if (pv.length < C) pv = new Float64Array(C);
  const nt = triangleCount(set), nb = Math.ceil(nt / SUM_BLOCK), K = L.K;
  if (triUn.length < 3 * nt) { triUn = new Float64Array(3 * nt); triArea = new Float64Array(nt); triRho = new Float64Array(3 * nt); }
  const tri = summed?.tri ?? { un: triUn, rho: triRho, area: triArea };
  if (blockOut.length < nb * K) blockOut = new Float64Array(Math.max(nb * K, 2 * blockOut.length));
  const blocks = summed?.sums ?? blockOut;
  for (let b = 0; b < nb; b++) if (!summed || summed.done[b] !== 1) blockSums(set, L, 0, nt, b, b + 1, tri, blocks);
  // The block sums in block order, the first block's as the start (a single block is the one pass's sums).
  if (acc.length < K - N_SUMS) acc = new Float64Array(K - N_SUMS);
  sums.fill(0); acc.fill(0);
  if (nb > 0) { for (let k = 0; k < N_SUMS; k++) sums[k] = blocks[k]!; for (let k = N_SUMS; k < K; k++) acc[k - N_SUMS] = blocks[k]!; }
  for (let b = 1; b < nb; b++) {
    const o = K * b;
    for (let k = 0; k < N_SUMS; k++) sums[k] += blocks[o + k]!;
    for (let k = N_SUMS; k < K; k++) acc[k - N_SUMS] += blocks[o + k]!;
  }
  let A = sums[S_A]!, cx = sums[S_CX]!, cy = sums[S_CY]!, cz = sums[S_CZ]!, Q = sums[S_Q]!, M = sums[S_M]!;
  let P0a = sums[S_P0A]!, P0m = sums[S_P0M]!, Nx = sums[S_NX]!, Ny = sums[S_NY]!, Nz = sums[S_NZ]!;
  let Aneg = sums[S_ANEG]!, Qneg = sums[S_QNEG]!, Mneg = sums[S_MNEG]!;

  const { lo, hi } = ranges(fields, chOf, magCh, magNc);

  if (arcs) {
    const [nx, ny, nz] = arcs.normal, W = arcs.weights, X = arcs.positions, na = W.length;
    for (let i = 0; i < na; i++) {
      for (let f = 0; f < fields.length; f++) {
        const nc = fields[f]!.components, o = chOf[f]!, src = arcs.values[f]!;
        for (let c = 0; c < nc; c++) pv[o + c] = src[i * nc + c]!;
      }
      for (let ch = 0; ch < C; ch++) { const v = pv[ch]!; if (v < lo[ch]!) lo[ch] = v; if (v > hi[ch]!) hi[ch] = v; }
      const w = W[i]!;
      let un = 0, u2 = 0;
      if (uCh >= 0) { const ux = pv[uCh]!, uy = pv[uCh + 1]!, uz = pv[uCh + 2]!; un = ux * nx + uy * ny + uz * nz; u2 = ux * ux + uy * uy + uz * uz; }
      const rho = rCh >= 0 ? pv[rCh]! : rho0, wm = w * rho * un;
      A += w; cx += w * X[3 * i]!; cy += w * X[3 * i + 1]!; cz += w * X[3 * i + 2]!; Q += w * un; M += wm;
      Nx += w * nx; Ny += w * ny; Nz += w * nz;
      if (un < 0) { Aneg += w; Qneg += w * un; Mneg += wm; }
      for (let ch = 0; ch < C; ch++) { const v = pv[ch]!; acc[ch] += w * v; acc[C + ch] += wm * v; }
      for (let k = 0; k < nMag; k++) {
        let s2 = 0;
        for (let c = 0; c < magNc[k]!; c++) { const v = pv[magCh[k]! + c]!; s2 += v * v; }
        const m = Math.sqrt(s2);
        acc[2 * C + 2 * k] += w * m; acc[2 * C + 2 * k + 1] += wm * m;
        if (m < lo[C + k]!) lo[C + k] = m; if (m > hi[C + k]!) hi[C + k] = m;
      }
      if (withP0) { const p0 = pv[pCh]! + 0.5 * (halfRho ? rho : 1) * u2; P0a += w * p0; P0m += wm * p0; }
    }
  }

  const base: SurfaceIntegrals = {
    empty: true, reason: null, triangles: nt, area: null, centroid: null, normal: null, volumeFlowRate: null, massFlowRate: null,
    integral: {}, areaMean: {}, massFlowMean: {}, magnitudeAreaMean: {}, magnitudeMassFlowMean: {}, min: {}, max: {},
    magnitudeMin: {}, magnitudeMax: {}, staticPressure: null, totalPressure: null, uniformityIndex: null, reverseFlow: null, roles, notes,
  };
  if (!(A > 0)) { base.reason = nt === 0 && !arcs?.weights.length ? 'the surface has no triangles (the plane misses the mesh or the region is empty)' : 'the surface has zero area'; return base; }

  const res = base;
  res.empty = false;
  res.area = A;
  res.centroid = [cx / A, cy / A, cz / A];
  const nl = Math.hypot(Nx, Ny, Nz);
  res.normal = nl > 0 ? [Nx / nl, Ny / nl, Nz / nl] : null;
  const massOk = uCh >= 0 && hasRho;
  if (uCh >= 0) res.volumeFlowRate = Q; else notes.push('no velocity field: flow rates, mass-flow means and total pressure are not computed');
  if (uCh >= 0 && !hasRho) notes.push('no density (give a constant or a field): mass-flow rate and mass-flow-weighted means are not computed');
  if (massOk) res.massFlowRate = M;
  // Mass-flow means divide by ṁ; when inflow and outflow nearly cancel they mean nothing.
  const absM = M - 2 * Mneg;
  const mMeanOk = massOk && M !== 0 && Math.abs(M) > 1e-9 * Math.abs(absM);
  if (massOk && !mMeanOk) notes.push('net mass-flow rate is zero: mass-flow-weighted means are undefined');
  for (let i = 0; i < fields.length; i++) {
    const f = fields[i]!, o = chOf[i]!, nc = f.components, key = keyOf(fields, f);
    const pick = (arr: (ch: number) => number): Stat => (nc === 1 ? arr(o) : Array.from({ length: nc }, (_, c) => arr(o + c)));
    res.integral[key] = pick((ch) => acc[ch]!);
    res.areaMean[key] = pick((ch) => acc[ch]! / A);
    if (mMeanOk) res.massFlowMean[key] = pick((ch) => acc[C + ch]! / M);
    res.min[key] = pick((ch) => lo[ch]!);
    res.max[key] = pick((ch) => hi[ch]!);
  }
  vecs.forEach((fi, q) => {
    const key = keyOf(fields, fields[fi]!);
    res.magnitudeAreaMean[key] = acc[2 * C + 2 * q]! / A;
    if (mMeanOk) res.magnitudeMassFlowMean[key] = acc[2 * C + 2 * q + 1]! / M;
    res.magnitudeMin[key] = lo[C + q]!;
    res.magnitudeMax[key] = hi[C + q]!;
  });
  if (pCh >= 0) res.staticPressure = { areaMean: acc[pCh]! / A, massFlowMean: mMeanOk ? acc[C + pCh]! / M : null, kinematic };
  if (pCh >= 0 && uCh >= 0 && (hasRho || kinematic)) {
    res.totalPressure = { areaMean: P0a / A, massFlowMean: mMeanOk ? P0m / M : null, kinematic };
    if (rCh >= 0 && !kinematic) notes.push('density is a field: the mass-flow mean of total pressure (degree 5) is not integrated exactly');
  } else if (uCh >= 0) {
    notes.push(pCh < 0 ? 'no pressure field: total pressure not computed' : 'no density: total pressure needs ρ (or kinematic pressure)');
  }
  if (uCh >= 0) {
    res.reverseFlow = {
      area: Aneg, areaShare: Aneg / A, volumeFlowRate: Qneg,
      massFlowRate: massOk ? Mneg : null, massShare: massOk && absM !== 0 ? -Mneg / absM : null,
    };
    const un = Q / A;
    if (un !== 0) res.uniformityIndex = 1 - absDeviation(nt, un, tri, fields, chOf, uCh, arcs) / (2 * Math.abs(un) * A);
    else notes.push('mean normal velocity is zero: uniformity index undefined');
  }
  return res;
}

// Sums of the triangle pass, by slot.
const S_A = 0, S_CX = 1, S_CY = 2, S_CZ = 3, S_Q = 4, S_M = 5, S_P0A = 6, S_P0M = 7, S_NX = 8, S_NY = 9, S_NZ = 10;
const S_ANEG = 11, S_QNEG = 12, S_MNEG = 13, N_SUMS = 14;
const sums = new Float64Array(N_SUMS);
let blockOut = new Float64Array(0);
/** Triangles per call of `triangleSums` (see its caller). */
const TRIANGLE_RUN = 64;

/**
 * The triangle pass of `integrateSurface`, on its own so the engine optimises this small loop early and
 * keeps it (one large function was compiled several times over on the first cuts of a session): area,
 * centroid and normal sums, Q, ṁ and p₀ into `sums` (running sums carried between calls over triangles
 * tBegin … tEnd − 1), ∫φ and ∫ρu_nφ into `acc`, u·n, density and area per triangle into
 * `triUn`/`triRho`/`triArea` (the reverse-flow parts follow from them in `reverseFlowSums`). Channel numbers are −1 when the role has no field
 * (`pCh` also when total pressure is not reported: `SumLayout.p0Ch`); `halfRho` is 0 for kinematic pressure; scratch arrays are sized by the caller.
 */
function triangleSums(P: Float64Array, I: Uint32Array, values: Float64Array[], perVertex: Uint8Array, chOf: Int32Array,
  C: number, uCh: number, pCh: number, rCh: number, rho0: number, halfRho: number, needCh: Int32Array, magCh: Int32Array,
  magNc: Int32Array, tBegin: number, tEnd: number, first: number, tUn: Float64Array, tRho: Float64Array, tArea: Float64Array): void {
  const nf = values.length, nMag = magCh.length;
  // Module scratch in locals: a module-level `let` is read through its context, with a check, at every use.
  const V = vv, E = e7, S = acc, W = wmq;
  const withP0 = pCh >= 0 && uCh >= 0;
  const wts = TRI7.weight;
  const w0 = wts[0]!, w1 = wts[1]!, w2 = wts[2]!, w3 = wts[3]!, w4 = wts[4]!, w5 = wts[5]!, w6 = wts[6]!;
  let A = sums[S_A]!, cx = sums[S_CX]!, cy = sums[S_CY]!, cz = sums[S_CZ]!, Q = sums[S_Q]!, M = sums[S_M]!;
  let P0a = sums[S_P0A]!, P0m = sums[S_P0M]!, Nx = sums[S_NX]!, Ny = sums[S_NY]!, Nz = sums[S_NZ]!;
  for (let t = tBegin; t < tEnd; t++) {
    const a = 3 * I[3 * t]!, b = 3 * I[3 * t + 1]!, c = 3 * I[3 * t + 2]!;
    const ax = P[a]!, ay = P[a + 1]!, az = P[a + 2]!;
    const ux = P[b]! - ax, uy = P[b + 1]! - ay, uz = P[b + 2]! - az, wx = P[c]! - ax, wy = P[c + 1]! - ay, wz = P[c + 2]! - az;
    let nx = uy * wz - uz * wy, ny = uz * wx - ux * wz, nz = ux * wy - uy * wx;
    const n2 = Math.sqrt(nx * nx + ny * ny + nz * nz), g = t + first;
    tArea[g] = 0.5 * n2;
    if (n2 === 0) continue;
    const area = 0.5 * n2, a3 = area / 3;
    Nx += 0.5 * nx; Ny += 0.5 * ny; Nz += 0.5 * nz;
    nx /= n2; ny /= n2; nz /= n2;
    A += area;
    cx += a3 * (3 * ax + ux + wx); cy += a3 * (3 * ay + uy + wy); cz += a3 * (3 * az + uz + wz);
    gather(values, perVertex, chOf, nf, I, t, V);
    let g0 = 0, g1 = 0, g2 = 0;
    if (uCh >= 0) {
      g0 = V[3 * uCh]! * nx + V[3 * uCh + 3]! * ny + V[3 * uCh + 6]! * nz;
      g1 = V[3 * uCh + 1]! * nx + V[3 * uCh + 4]! * ny + V[3 * uCh + 7]! * nz;
      g2 = V[3 * uCh + 2]! * nx + V[3 * uCh + 5]! * ny + V[3 * uCh + 8]! * nz;
    }
    tUn[3 * g] = g0; tUn[3 * g + 1] = g1; tUn[3 * g + 2] = g2;
    const r0 = rCh >= 0 ? V[3 * rCh]! : rho0, r1 = rCh >= 0 ? V[3 * rCh + 1]! : rho0, r2 = rCh >= 0 ? V[3 * rCh + 2]! : rho0;
    tRho[3 * g] = r0; tRho[3 * g + 1] = r1; tRho[3 * g + 2] = r2;
    // Values of the non-linear parts' inputs at the rule's 7 points (vertices, midpoints, centroid).
    for (let i = 0; i < needCh.length; i++) {
      const ch = needCh[i]!, v0 = V[3 * ch]!, v1 = V[3 * ch + 1]!, v2 = V[3 * ch + 2]!, o = 7 * ch;
      E[o] = v0; E[o + 1] = v1; E[o + 2] = v2;
      E[o + 3] = 0.5 * (v0 + v1); E[o + 4] = 0.5 * (v1 + v2); E[o + 5] = 0.5 * (v0 + v2); E[o + 6] = (v0 + v1 + v2) / 3;
    }
    // Mass weights ρu_n·w at the points; for a linear φ, ∫ρu_nφ = Σ_q wm_q Σ_j λ_qj φ_j = Σ_j M_j φ_j.
    const gm3 = 0.5 * (g0 + g1), gm4 = 0.5 * (g1 + g2), gm5 = 0.5 * (g0 + g2), gc = (g0 + g1 + g2) / 3;
    const wv = area * wts[0]!, wmid = area * wts[3]!, wc = area * wts[6]!;
    W[0] = wv * r0 * g0; W[1] = wv * r1 * g1; W[2] = wv * r2 * g2;
    W[3] = wmid * 0.5 * (r0 + r1) * gm3; W[4] = wmid * 0.5 * (r1 + r2) * gm4; W[5] = wmid * 0.5 * (r0 + r2) * gm5;
    W[6] = wc * ((r0 + r1 + r2) / 3) * gc;
    const c3 = W[6]! / 3;
    const M0 = W[0]! + 0.5 * (W[3]! + W[5]!) + c3, M1 = W[1]! + 0.5 * (W[3]! + W[4]!) + c3, M2 = W[2]! + 0.5 * (W[4]! + W[5]!) + c3;
    Q += a3 * (g0 + g1 + g2); M += M0 + M1 + M2;
    for (let k = 0; k < nMag; k++) {
      const o = 7 * magCh[k]!, nc = magNc[k]!;
      let sa = 0, sm = 0;
      if (nc === 3) {
        // A 3-vector at the rule's 7 points straight from its vertex values: the values `e7` would hold (plain
        // means) and the same additions in the same order, in locals (about a third of the pass's time went to
        // the round trip through `e7`).
        const v = 3 * magCh[k]!;
        const x0 = V[v]!, x1 = V[v + 1]!, x2 = V[v + 2]!, y0 = V[v + 3]!, y1 = V[v + 4]!, y2 = V[v + 5]!, z0 = V[v + 6]!, z1 = V[v + 7]!, z2 = V[v + 8]!;
        const m0 = Math.sqrt(x0 * x0 + y0 * y0 + z0 * z0), m1 = Math.sqrt(x1 * x1 + y1 * y1 + z1 * z1), m2 = Math.sqrt(x2 * x2 + y2 * y2 + z2 * z2);
        const x3 = 0.5 * (x0 + x1), y3 = 0.5 * (y0 + y1), z3 = 0.5 * (z0 + z1), m3 = Math.sqrt(x3 * x3 + y3 * y3 + z3 * z3);
        const x4 = 0.5 * (x1 + x2), y4 = 0.5 * (y1 + y2), z4 = 0.5 * (z1 + z2), m4 = Math.sqrt(x4 * x4 + y4 * y4 + z4 * z4);
        const x5 = 0.5 * (x0 + x2), y5 = 0.5 * (y0 + y2), z5 = 0.5 * (z0 + z2), m5 = Math.sqrt(x5 * x5 + y5 * y5 + z5 * z5);
        const x6 = (x0 + x1 + x2) / 3, y6 = (y0 + y1 + y2) / 3, z6 = (z0 + z1 + z2) / 3, m6 = Math.sqrt(x6 * x6 + y6 * y6 + z6 * z6);
        sa += area * w0 * m0; sa += area * w1 * m1; sa += area * w2 * m2; sa += area * w3 * m3; sa += area * w4 * m4; sa += area * w5 * m5; sa += area * w6 * m6;
        sm += W[0]! * m0; sm += W[1]! * m1; sm += W[2]! * m2; sm += W[3]! * m3; sm += W[4]! * m4; sm += W[5]! * m5; sm += W[6]! * m6;
        S[2 * C + 2 * k] += sa; S[2 * C + 2 * k + 1] += sm;
        continue;
      }
      for (let q = 0; q < 7; q++) {
        let s2 = 0;
        for (let cc = 0; cc < nc; cc++) { const v = E[o + 7 * cc + q]!; s2 += v * v; }
        const m = Math.sqrt(s2);
        sa += area * wts[q]! * m; sm += W[q]! * m;
      }
      S[2 * C + 2 * k] += sa; S[2 * C + 2 * k + 1] += sm;
    }
    if (withP0) {
      const ou = 7 * uCh, op = 7 * pCh, or = 7 * rCh;
      for (let q = 0; q < 7; q++) {
        const vx = E[ou + q]!, vy = E[ou + 7 + q]!, vz = E[ou + 14 + q]!;
        const rho = halfRho ? (rCh >= 0 ? E[or + q]! : rho0) : 1;
        const p0 = E[op + q]! + 0.5 * rho * (vx * vx + vy * vy + vz * vz);
        P0a += area * wts[q]! * p0; P0m += W[q]! * p0;
      }
    }
    for (let ch = 0; ch < C; ch++) {
      const v0 = V[3 * ch]!, v1 = V[3 * ch + 1]!, v2 = V[3 * ch + 2]!;
      S[ch] += a3 * (v0 + v1 + v2);
      S[C + ch] += M0 * v0 + M1 * v1 + M2 * v2;
    }
  }
  sums[S_A] = A; sums[S_CX] = cx; sums[S_CY] = cy; sums[S_CZ] = cz; sums[S_Q] = Q; sums[S_M] = M;
  sums[S_P0A] = P0a; sums[S_P0M] = P0m; sums[S_NX] = Nx; sums[S_NY] = Ny; sums[S_NZ] = Nz;
}

/**
 * The reverse-flow sums (into revArea, revFlow, revMass) of triangles t0 … t1 − 1 from the triangle pass's per-triangle
 * u·n, density and area, in triangle order. A pass of its own: its call of `belowPart` runs only where the flow reverses, often
 * first late in a cut, and inside the large triangle pass it made the engine throw that pass's optimised code
 * away and compile it again.
 */
function reverseFlowSums(t0: number, t1: number, tri: TriangleScratch): void {
  const un = tri.un, rho = tri.rho, ar = tri.area;
  let Aneg = 0, Qneg = 0, Mneg = 0;
  for (let t = t0; t < t1; t++) {
    const area = ar[t]!;
    if (area === 0) continue;
    const g0 = un[3 * t]!, g1 = un[3 * t + 1]!, g2 = un[3 * t + 2]!;
    if (g0 < 0 || g1 < 0 || g2 < 0) {
      belowPart(area, g0, g1, g2, rho[3 * t]!, rho[3 * t + 1]!, rho[3 * t + 2]!);
      Aneg += partArea; Qneg += partInt; Mneg += partWeighted;
    }
  }
  revArea = Aneg; revFlow = Qneg; revMass = Mneg;
}
let revArea = 0, revFlow = 0, revMass = 0;

/** Fills `vv` with the vertex values of triangle t (cell fields repeated on the three vertices). */
function gather(values: Float64Array[], perVertex: Uint8Array, chOf: Int32Array, nf: number, I: Uint32Array, t: number, vv: Float64Array): void {
  const v0 = I[3 * t]!, v1 = I[3 * t + 1]!, v2 = I[3 * t + 2]!;
  for (let i = 0; i < nf; i++) {
    const vals = values[i]!, o = chOf[i]!, nc = chOf[i + 1]! - o;
    if (perVertex[i] === 1) {
      for (let c = 0; c < nc; c++) {
        const k = 3 * (o + c);
        vv[k] = vals[v0 * nc + c]!; vv[k + 1] = vals[v1 * nc + c]!; vv[k + 2] = vals[v2 * nc + c]!;
      }
    } else {
      for (let c = 0; c < nc; c++) { const k = 3 * (o + c), v = vals[t * nc + c]!; vv[k] = v; vv[k + 1] = v; vv[k + 2] = v; }
    }
  }
}

let partArea = 0, partInt = 0, partWeighted = 0;

/**
 * Over the part of a triangle (area `area`) where the linear g (vertex values g0..g2) is negative:
 * sets partArea, partInt = ∫(g) dA and partWeighted = ∫r·g dA with r linear (vertex values r0..r2). Exact.
 */
function belowPart(area: number, g0: number, g1: number, g2: number, r0: number, r1: number, r2: number): void {
  let m = 0;
  for (let i = 0; i < 3; i++) {
    const j = (i + 1) % 3, gi = i === 0 ? g0 : i === 1 ? g1 : g2, gj = j === 0 ? g0 : j === 1 ? g1 : g2;
    if (gi < 0) { sub[3 * m] = i === 0 ? 1 : 0; sub[3 * m + 1] = i === 1 ? 1 : 0; sub[3 * m + 2] = i === 2 ? 1 : 0; m++; }
    if ((gi < 0) !== (gj < 0)) {
      const s = gi / (gi - gj);
      sub[3 * m] = 0; sub[3 * m + 1] = 0; sub[3 * m + 2] = 0;
      sub[3 * m + i] = 1 - s; sub[3 * m + j] = s;
      m++;
    }
  }
  partArea = 0; partInt = 0; partWeighted = 0;
  for (let k = 1; k < m - 1; k++) {
    // Sub-triangle (0, k, k+1) in barycentric coordinates: area ratio = |det|.
    const a0 = sub[0]!, a1 = sub[1]!, a2 = sub[2]!, b0 = sub[3 * k]!, b1 = sub[3 * k + 1]!, b2 = sub[3 * k + 2]!;
    const c0 = sub[3 * k + 3]!, c1 = sub[3 * k + 4]!, c2 = sub[3 * k + 5]!;
    const det = Math.abs(a0 * (b1 * c2 - b2 * c1) - a1 * (b0 * c2 - b2 * c0) + a2 * (b0 * c1 - b1 * c0));
    const As = area * det;
    const ga = a0 * g0 + a1 * g1 + a2 * g2, gb = b0 * g0 + b1 * g1 + b2 * g2, gc = c0 * g0 + c1 * g1 + c2 * g2;
    const ra = a0 * r0 + a1 * r1 + a2 * r2, rb = b0 * r0 + b1 * r1 + b2 * r2, rc = c0 * r0 + c1 * r1 + c2 * r2;
    partArea += As;
    partInt += As * (ga + gb + gc) / 3;
    // ∫fg over a triangle = A/12 (Σ f_i g_i + Σf_i Σg_i), exact for linear f, g.
    partWeighted += As / 12 * (ga * ra + gb * rb + gc * rc + (ga + gb + gc) * (ra + rb + rc));
  }
}

/** ∫|u·n − ū_n| dA, exact on triangles (split where the linear u·n crosses ū_n), from the first pass's per-triangle data. */
function absDeviation(nt: number, un: number, tri: TriangleScratch, fields: readonly SurfaceField[], chOf: Int32Array, uCh: number, arcs?: ArcCloud): number {
  const tu = tri.un, ta = tri.area;
  let s = 0;
  for (let t = 0; t < nt; t++) {
    const area = ta[t]!;
    if (area === 0) continue;
    const g0 = tu[3 * t]! - un, g1 = tu[3 * t + 1]! - un, g2 = tu[3 * t + 2]! - un;
    const whole = area * (g0 + g1 + g2) / 3;
    if (g0 >= 0 && g1 >= 0 && g2 >= 0) { s += whole; continue; }
    belowPart(area, g0, g1, g2, 1, 1, 1);
    // ∫|g| = ∫g − 2∫_{g<0} g.
    s += whole - 2 * partInt;
  }
  if (arcs) {
    const [nx, ny, nz] = arcs.normal, k = fields.findIndex((_, i) => chOf[i] === uCh), vals = arcs.values[k]!, nc = fields[k]!.components;
    for (let i = 0; i < arcs.weights.length; i++) {
      const g = vals[i * nc]! * nx + vals[i * nc + 1]! * ny + vals[i * nc + 2]! * nz - un;
      s += arcs.weights[i]! * Math.abs(g);
    }
  }
  return s;
}

/** Min and max of every channel and vector magnitude over the vertices (point fields) and triangles (cell fields) of a set. */
function ranges(fields: readonly SurfaceField[], chOf: Int32Array, magCh: Int32Array, magNc: Int32Array): { lo: Float64Array; hi: Float64Array } {
  const C = chOf[fields.length]!, nMag = magCh.length;
  const lo = new Float64Array(C + nMag).fill(Infinity), hi = new Float64Array(C + nMag).fill(-Infinity);
  for (let i = 0; i < fields.length; i++) {
    const f = fields[i]!, nc = f.components, v = f.values, o = chOf[i]!;
    const q = magCh.indexOf(o);
    if (nc === 3 && q >= 0 && magNc[q] === 3) {
      // A 3-vector's components and magnitude in one pass (the four passes below read it four times).
      vectorRange(v, lo, hi, o, C + q);
      continue;
    }
    for (let c = 0; c < nc; c++) { strideRange(v, c, nc); lo[o + c] = rangeLo; hi[o + c] = rangeHi; }
    if (q >= 0 && magNc[q] === nc) { magnitudeRange(v, nc); lo[C + q] = rangeLo; hi[C + q] = rangeHi; }
  }
  return { lo, hi };
}

let rangeLo = Infinity, rangeHi = -Infinity;

/**
 * Min and max (into rangeLo, rangeHi) of v[c], v[c + nc], v[c + 2nc] …. Each loop is a small function of its
 * own so the engine optimises it on a file's first cuts instead of running it unoptimised inside a larger one.
 */
function strideRange(v: Float64Array, c: number, nc: number): void {
  let l = Infinity, h = -Infinity;
  for (let k = c; k < v.length; k += nc) { const x = v[k]!; if (x < l) l = x; if (x > h) h = x; }
  rangeLo = l; rangeHi = h;
}

/** Min and max of each component of the 3-vectors of v into lo/hi from `o`, and of their magnitudes at `m`; the same values as `strideRange` and `magnitudeRange`. */
function vectorRange(v: Float64Array, lo: Float64Array, hi: Float64Array, o: number, m: number): void {
  let lx = Infinity, hx = -Infinity, ly = Infinity, hy = -Infinity, lz = Infinity, hz = -Infinity, lm = Infinity, hm = -Infinity;
  for (let k = 0; k < v.length; k += 3) {
    const x = v[k]!, y = v[k + 1]!, z = v[k + 2]!;
    if (x < lx) lx = x; if (x > hx) hx = x;
    if (y < ly) ly = y; if (y > hy) hy = y;
    if (z < lz) lz = z; if (z > hz) hz = z;
    let s2 = 0;
    s2 += x * x; s2 += y * y; s2 += z * z;
    const r = Math.sqrt(s2);
    if (r < lm) lm = r; if (r > hm) hm = r;
  }
  lo[o] = lx; hi[o] = hx; lo[o + 1] = ly; hi[o + 1] = hy; lo[o + 2] = lz; hi[o + 2] = hz; lo[m] = lm; hi[m] = hm;
}

/** Min and max (into rangeLo, rangeHi) of the magnitudes of the nc-component tuples of v. */
function magnitudeRange(v: Float64Array, nc: number): void {
  const n = v.length / nc;
  let l = Infinity, h = -Infinity;
  for (let k = 0; k < n; k++) {
    let s2 = 0;
    for (let c = 0; c < nc; c++) { const x = v[k * nc + c]!; s2 += x * x; }
    const m = Math.sqrt(s2);
    if (m < l) l = m; if (m > h) h = m;
  }
  rangeLo = l; rangeHi = h;
}
