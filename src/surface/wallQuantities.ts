/**
 * Wall quantities on a set of boundary faces: wall shear stress (vector and magnitude), skin-friction
 * coefficient c_f, y⁺ of the first cell, their area-weighted statistics, the area share above y⁺
 * thresholds and a y⁺ histogram.
 *
 * Definitions (per face, one value each):
 *  - τ_w: the tangential part of the viscous traction the fluid exerts on the wall, from `surfaceLoads`:
 *    the file's wall-shear array when there is one (or asked for), else −μ(∇u + ∇uᵀ)·n̂ from the velocity
 *    gradient (second order at the nodes by default); the face value is the mean of its corners (Pa).
 *  - c_f = |τ_w| / (½ρU²) on the reference density ρ and speed U.
 *  - y⁺ = y·u_τ/ν with u_τ = √(|τ_w|/ρ), ν = μ/ρ; y the wall distance of the first cell, by default of
 *    the wall cell's centroid (vertex average) from the face plane — common practice for cell-centred
 *    solvers — or of the first off-wall node (the nearest node of the wall cell not on the face) —
 *    common practice for node-based ones.
 * Statistics: area-weighted mean, min and max over the faces; area share = Σ area(y⁺ > t) / Σ area.
 * Units: the file's, assumed consistent SI (Pa, m, kg/m³, Pa·s); y⁺ and c_f dimensionless.
 */
import type { Dataset } from '../model/dataset.ts';
import type { BoundaryFaces } from './boundaryFaces.ts';
import { surfaceLoads, type LoadOptions, type SurfaceLoads } from './surfaceLoads.ts';

/** Options of `wallQuantities`; defaults in WALL_DEFAULTS. */
export interface WallOptions {
  /** Density ρ (kg/m³): needed for y⁺ and c_f. */
  density: number | undefined;
  /** Dynamic viscosity μ (Pa·s): a constant, or an array name (used for the gradient route and y⁺). */
  viscosity: number | string | undefined;
  /** Reference speed U (m/s) for c_f. */
  speed: number | undefined;
  /** Which wall distance y⁺ uses (see the file comment). Default 'cell-centroid'. */
  wallDistance: 'cell-centroid' | 'first-node';
  /** y⁺ thresholds for the area shares. Default [1, 5, 30]. */
  thresholds: number[];
  /** Histogram bins of y⁺ between 0 and its maximum. Default 10. */
  bins: number;
  /** Where τ_w comes from: 'auto' (wall-shear array if present, else the gradient), 'wall-shear', 'gradient'. */
  source: 'auto' | 'wall-shear' | 'gradient';
  /** Passed on to `surfaceLoads` (array names, sign, gradient order). */
  loads: Partial<Pick<LoadOptions, 'wallShear' | 'wallShearSign' | 'velocity' | 'wallGradient' | 'pressure'>>;
}

export const WALL_DEFAULTS: WallOptions = {
  density: undefined, viscosity: undefined, speed: undefined, wallDistance: 'cell-centroid', thresholds: [1, 5, 30], bins: 10,
  source: 'auto', loads: {},
};

/** Area-weighted mean, min and max of a per-face quantity. */
export interface WallStat { mean: number; min: number; max: number }

export interface WallResult {
  faces: number;
  /** Σ face area (length unit²). */
  area: number;
  /** How τ_w was found (array name or the velocity gradient and its order). */
  shearSource: SurfaceLoads['viscous'];
  /** Per face, in selection order. */
  perFace: {
    area: Float64Array;
    /** τ_w, 3 per face (Pa). */
    shear: Float64Array;
    shearMagnitude: Float64Array;
    /** Wall distance y used for y⁺ (length unit). */
    wallDistance: Float64Array;
    cf: Float64Array | null;
    yPlus: Float64Array | null;
  };
  stats: { shearMagnitude: WallStat; cf: WallStat | null; yPlus: WallStat | null; wallDistance: WallStat };
  /** Area share with y⁺ above each threshold (0 … 1); empty without y⁺. */
  yPlusAbove: { threshold: number; areaShare: number }[];
  /** y⁺ histogram: `edges` (bins + 1) and the area share per bin; null without y⁺. */
  yPlusHistogram: { edges: number[]; areaShare: number[] } | null;
  wallDistanceDefinition: string;
  notes: string[];
}

/** Running area-weighted sum, weight, minimum and maximum of one per-face quantity. */
interface Sums { s: number; sw: number; lo: number; hi: number }
const newSums = (): Sums => ({ s: 0, sw: 0, lo: Infinity, hi: -Infinity });
function add(a: Sums, x: number, w: number): void {
  a.s += w * x; a.sw += w;
  if (x < a.lo) a.lo = x;
  if (x > a.hi) a.hi = x;
}
/** Area-weighted mean, min and max from the sums (NaN for no faces). */
const statOf = (a: Sums, n: number): WallStat => (n ? { mean: a.s / a.sw, min: a.lo, max: a.hi } : { mean: NaN, min: NaN, max: NaN });

/**
 * Wall quantities over the faces of `selection` (boundary faces of `d`). Throws when τ_w cannot be found
 * (no wall-shear array and no velocity or μ), naming what is missing.
 */
export function wallQuantities(d: Dataset, faces: BoundaryFaces, selection: Int32Array, options: Partial<WallOptions> = {},
  surfaceCell?: Int32Array): WallResult {
  const o = { ...WALL_DEFAULTS, ...options };
  for (const [k, v] of [['density', o.density], ['speed', o.speed]] as const) {
    if (v !== undefined && !(v > 0 && Number.isFinite(v))) throw new Error(`wall quantities: ${k} must be a positive number, got ${v}`);
  }
  if (typeof o.viscosity === 'number' && !(o.viscosity > 0)) throw new Error(`wall quantities: viscosity must be a positive number, got ${o.viscosity}`);
  if (!(Number.isInteger(o.bins) && o.bins >= 1 && o.bins <= 1000)) throw new Error(`wall quantities: histogram bins must be a whole number 1 … 1000, got ${o.bins}`);
  const loads = surfaceLoads(d, faces, selection, {
    ...o.loads, viscous: o.source, mu: o.viscosity, pRef: 0,
  }, surfaceCell);
  if (!loads.traction) throw new Error(`wall quantities: ${loads.notes.find((n) => n.startsWith('viscous force not computed')) ?? 'no wall shear'} (give --mu and a velocity, or a wall-shear array)`);
  const n = selection.length, T = loads.traction, off = loads.offsets;
  const area = new Float64Array(n), shear = new Float64Array(3 * n), mag = new Float64Array(n), dist = new Float64Array(n);
  const muArrays = typeof o.viscosity === 'string' ? d.pieces.map((p) => p.cellData.find((f) => f.name === o.viscosity && f.components === 1) ?? p.pointData.find((f) => f.name === o.viscosity && f.components === 1)) : undefined;
  const muConstant = typeof o.viscosity === 'number' ? o.viscosity : 0;
  const notes = [...loads.notes.filter((x) => !x.startsWith('pressure'))];
  const rho = o.density, haveMu = o.viscosity !== undefined;
  const withCf = rho !== undefined && o.speed !== undefined, withYPlus = rho !== undefined && haveMu;
  if (!withCf) notes.push('c_f not computed: give the reference density and speed');
  if (!withYPlus) notes.push('y+ not computed: give the density and the viscosity');
  const q = withCf ? 0.5 * rho * o.speed! * o.speed! : 1;
  const cf = withCf ? new Float64Array(n) : null, yPlus = withYPlus ? new Float64Array(n) : null;
  // one pass: per-face values and the area-weighted sums, minima and maxima of the statistics
  const acc = { mag: newSums(), cf: newSums(), yPlus: newSums(), dist: newSums() };
  let total = 0;
  for (let k = 0; k < n; k++) {
    const f = selection[k]!, piece = faces.piece[f]!, p = d.pieces[piece]!, c = faces.cell[f]! - faces.cellStarts[piece]!;
    const ax = faces.areaVector[3 * f]!, ay = faces.areaVector[3 * f + 1]!, az = faces.areaVector[3 * f + 2]!;
    const a = Math.sqrt(ax * ax + ay * ay + az * az);
    area[k] = a; total += a;
    const nx = a > 0 ? ax / a : 0, ny = a > 0 ? ay / a : 0, nz = a > 0 ? az / a : 0;
    let tx = 0, ty = 0, tz = 0;
    const m = off[k + 1]! - off[k]!;
    for (let j = off[k]!; j < off[k + 1]!; j++) { tx += T[3 * j]!; ty += T[3 * j + 1]!; tz += T[3 * j + 2]!; }
    tx /= m; ty /= m; tz /= m;
    const tn = tx * nx + ty * ny + tz * nz;
    tx -= tn * nx; ty -= tn * ny; tz -= tn * nz;
    shear[3 * k] = tx; shear[3 * k + 1] = ty; shear[3 * k + 2] = tz;
    const tau = Math.sqrt(tx * tx + ty * ty + tz * tz), y = wallDistance(p, c, faces, f, nx, ny, nz, o.wallDistance);
    mag[k] = tau; dist[k] = y;
    add(acc.mag, tau, a); add(acc.dist, y, a);
    if (cf) { const v = tau / q; cf[k] = v; add(acc.cf, v, a); }
    let mu = muConstant;
    if (muArrays) {
      const arr = muArrays[piece];
      if (!arr) throw new Error(`${d.source}: viscosity array "${o.viscosity}" is missing from piece ${piece}`);
      if (arr.association === 'cell') mu = arr.values[c]!;
      else { let s = 0; for (let j = faces.offsets[f]!; j < faces.offsets[f + 1]!; j++) s += arr.values[faces.nodes[j]!]!; mu = s / (faces.offsets[f + 1]! - faces.offsets[f]!); }
    }
    if (yPlus) {
      const v = (y * Math.sqrt(tau / rho!) * rho!) / mu;
      yPlus[k] = v; add(acc.yPlus, v, a);
    }
  }
  // a second pass for what needs y+'s maximum or the total area: shares above thresholds and the histogram
  let yPlusAbove: WallResult['yPlusAbove'] = [];
  let yPlusHistogram: WallResult['yPlusHistogram'] = null;
  if (yPlus) {
    const th = Float64Array.from(o.thresholds), above = new Float64Array(th.length);
    const hi = n > 0 ? acc.yPlus.hi : 0, width = hi > 0 ? hi / o.bins : 1, bins = o.bins;
    const share = new Float64Array(bins);
    for (let k = 0; k < n; k++) {
      const v = yPlus[k]!, a = area[k]!;
      for (let t = 0; t < th.length; t++) if (v > th[t]!) above[t]! += a;
      if (n > 0) share[Math.min(bins - 1, Math.floor(v / width))]! += a / total;
    }
    yPlusAbove = o.thresholds.map((t, i) => ({ threshold: t, areaShare: total > 0 ? above[i]! / total : NaN }));
    if (n > 0) yPlusHistogram = { edges: Array.from({ length: bins + 1 }, (_, i) => i * width), areaShare: Array.from(share) };
  }
  return {
    faces: n, area: total, shearSource: loads.viscous,
    perFace: { area, shear, shearMagnitude: mag, wallDistance: dist, cf, yPlus },
    stats: { shearMagnitude: statOf(acc.mag, n), cf: cf ? statOf(acc.cf, n) : null, yPlus: yPlus ? statOf(acc.yPlus, n) : null, wallDistance: statOf(acc.dist, n) },
    yPlusAbove, yPlusHistogram,
    wallDistanceDefinition: o.wallDistance === 'cell-centroid'
      ? 'y = distance of the wall cell\'s centroid (vertex average) from the wall face\'s plane (common practice for cell-centred solvers)'
      : 'y = distance of the nearest node of the wall cell off the wall face from the face\'s plane (common practice for node-based solvers)',
    notes,
  };
}

/** Wall distance of face f's owning cell c (see the file comment); n̂ the face's unit normal out of the fluid. */
function wallDistance(p: Dataset['pieces'][number], c: number, faces: BoundaryFaces, f: number, nx: number, ny: number, nz: number,
  kind: WallOptions['wallDistance']): number {
  const pts = p.points, conn = p.connectivity, a = p.offsets[c]!, b = p.offsets[c + 1]!;
  const fx = faces.centroid[3 * f]!, fy = faces.centroid[3 * f + 1]!, fz = faces.centroid[3 * f + 2]!;
  const fa = faces.offsets[f]!, fb = faces.offsets[f + 1]!;
  if (kind === 'cell-centroid') {
    let x = 0, y = 0, z = 0;
    for (let j = a; j < b; j++) { const q = 3 * conn[j]!; x += pts[q]!; y += pts[q + 1]!; z += pts[q + 2]!; }
    const m = b - a;
    return (fx - x / m) * nx + (fy - y / m) * ny + (fz - z / m) * nz;
  }
  let best = Infinity;
  for (let j = a; j < b; j++) {
    const id = conn[j]!;
    let onFace = false;
    for (let i = fa; i < fb; i++) if (faces.nodes[i] === id) { onFace = true; break; }
    if (onFace) continue;
    const q = 3 * id, h = (fx - pts[q]!) * nx + (fy - pts[q + 1]!) * ny + (fz - pts[q + 2]!) * nz;
    if (h > 0 && h < best) best = h;
  }
  return best;
}
