/**
 * Force distribution along an axis: force per unit length in bins of s = x·a (a the unit axis) and the
 * cumulative drag, for plotting where along a body the load sits.
 *
 * Faces are split across bins exactly: each triangle of the faces' fan split (the one force totals use) is
 * clipped against the planes s = bin edge, and each clipped piece is integrated with the pressure and traction
 * interpolated linearly to the clip points. So the bins sum to the force total (`forces.ts`) to rounding, and a
 * face straddling bins puts into each bin exactly the load on its part. Sign convention and units as in
 * `forces.ts` (force on the wall); per-length values in force unit / length unit.
 */
import type { Dataset } from '../model/dataset.ts';
import type { BoundaryFaces } from './boundaryFaces.ts';
import type { Vec3 } from './forces.ts';
import type { SurfaceLoads } from './surfaceLoads.ts';

/** Options of `forceDistribution`. */
export interface DistributionOptions {
  /** Axis along which to bin (normalised). Default +x. */
  axis: Vec3;
  /** Number of bins. Default 50. */
  bins: number;
  /** [s_min, s_max] along the axis (length unit); default: the extent of the faces. */
  range: [number, number] | undefined;
  /** Direction of the drag component (normalised). Default: the axis. */
  dragDirection: Vec3 | undefined;
}

export const DISTRIBUTION_DEFAULTS: DistributionOptions = { axis: [1, 0, 0], bins: 50, range: undefined, dragDirection: undefined };

export interface ForceDistribution {
  axis: Vec3;
  dragDirection: Vec3;
  /** Bin edges along the axis, `bins + 1` values (length unit). */
  edges: Float64Array;
  /** Pressure force per unit length of each bin, 3 per bin. */
  pressure: Float64Array;
  /** Viscous force per unit length, 3 per bin; null when the loads have no traction. */
  viscous: Float64Array | null;
  /** Total force per unit length, 3 per bin. */
  total: Float64Array;
  /** Drag (total force · drag direction) per unit length of each bin. */
  dragPerLength: Float64Array;
  /** Drag accumulated from the first edge to each edge, `bins + 1` values (force unit). */
  cumulativeDrag: Float64Array;
  /** Force on the parts of faces outside the range (force unit); zeros with the default range. */
  outside: Vec3;
  split: 'exact';
}

const V = 7; // per clip vertex: x, y, z, p, tx, ty, tz
let polyA = new Float64Array(V * 8), polyB = new Float64Array(V * 8);
const tri = new Float64Array(V * 3);

/** Clips polygon `src` (n vertices) to the side where sign·(s − level) ≥ 0; returns the vertex count in `dst`. */
function clip(src: Float64Array, n: number, dst: Float64Array, ax: number, ay: number, az: number, level: number, sign: number): number {
  let out = 0;
  for (let i = 0; i < n; i++) {
    const j = i + 1 === n ? 0 : i + 1, a = V * i, b = V * j;
    const da = sign * (src[a]! * ax + src[a + 1]! * ay + src[a + 2]! * az - level);
    const db = sign * (src[b]! * ax + src[b + 1]! * ay + src[b + 2]! * az - level);
    if (da >= 0) { for (let k = 0; k < V; k++) dst[V * out + k] = src[a + k]!; out++; }
    if ((da >= 0) !== (db >= 0)) {
      const t = da / (da - db);
      for (let k = 0; k < V; k++) dst[V * out + k] = src[a + k]! + t * (src[b + k]! - src[a + k]!);
      out++;
    }
  }
  return out;
}

/** Adds ∫ over a planar polygon (fan from vertex 0) of p n dA and t dA into `into` at bin `b` (6 per bin: Fp, Fv). */
function integratePolygon(poly: Float64Array, n: number, into: Float64Array, b: number): void {
  const x0 = poly[0]!, y0 = poly[1]!, z0 = poly[2]!;
  for (let i = 1; i + 1 < n; i++) {
    const p = V * i, q = V * (i + 1);
    const ux = poly[p]! - x0, uy = poly[p + 1]! - y0, uz = poly[p + 2]! - z0;
    const vx = poly[q]! - x0, vy = poly[q + 1]! - y0, vz = poly[q + 2]! - z0;
    const sx = 0.5 * (uy * vz - uz * vy), sy = 0.5 * (uz * vx - ux * vz), sz = 0.5 * (ux * vy - uy * vx);
    const pm = (poly[3]! + poly[p + 3]! + poly[q + 3]!) / 3, area = Math.sqrt(sx * sx + sy * sy + sz * sz) / 3;
    into[6 * b] += pm * sx; into[6 * b + 1] += pm * sy; into[6 * b + 2] += pm * sz;
    into[6 * b + 3] += area * (poly[4]! + poly[p + 4]! + poly[q + 4]!);
    into[6 * b + 4] += area * (poly[5]! + poly[p + 5]! + poly[q + 5]!);
    into[6 * b + 5] += area * (poly[6]! + poly[p + 6]! + poly[q + 6]!);
  }
}

/**
 * Force per unit length along an axis over the faces of `loads` (see the file comment).
 * @throws Error for a zero axis, fewer than one bin or an empty range.
 */
export function forceDistribution(d: Dataset, faces: BoundaryFaces, loads: SurfaceLoads, options: Partial<DistributionOptions> = {}): ForceDistribution {
  const o = { ...DISTRIBUTION_DEFAULTS, ...options };
  const al = Math.hypot(...o.axis);
  if (!(al > 0)) throw new Error('distribution axis must be a non-zero vector');
  if (!(Number.isInteger(o.bins) && o.bins >= 1)) throw new Error(`distribution needs a whole number of bins ≥ 1, got ${o.bins}`);
  const ax = o.axis[0] / al, ay = o.axis[1] / al, az = o.axis[2] / al;
  const dd = o.dragDirection ?? o.axis, dl = Math.hypot(...dd);
  const drag: Vec3 = [dd[0] / dl, dd[1] / dl, dd[2] / dl];
  const sel = loads.selection, P = loads.pressure, T = loads.traction;
  let lo = Infinity, hi = -Infinity;
  if (o.range) [lo, hi] = o.range;
  else for (let k = 0; k < sel.length; k++) {
    const f = sel[k]!, pts = d.pieces[faces.piece[f]!]!.points;
    for (let j = faces.offsets[f]!; j < faces.offsets[f + 1]!; j++) {
      const q = 3 * faces.nodes[j]!, s = pts[q]! * ax + pts[q + 1]! * ay + pts[q + 2]! * az;
      if (s < lo) lo = s; if (s > hi) hi = s;
    }
  }
  if (!(hi > lo)) throw new Error(`distribution range is empty (${lo} … ${hi} along the axis)`);
  const bins = o.bins, width = (hi - lo) / bins;
  const sums = new Float64Array(6 * (bins + 1)); // the extra bin collects what lies outside the range
  for (let k = 0; k < sel.length; k++) {
    const f = sel[k]!, a = faces.offsets[f]!, m = faces.offsets[f + 1]! - a, o2 = loads.offsets[k]!;
    const pts = d.pieces[faces.piece[f]!]!.points;
    const tris = m === 3 ? 1 : m;
    for (let t = 0; t < tris; t++) {
      // Triangle vertices with their values: (node 0, 1, 2) or (fan centre, node t, node t+1).
      for (let v = 0; v < 3; v++) {
        const base = V * v;
        if (m > 3 && v === 0) {
          for (let k2 = 0; k2 < V; k2++) tri[k2] = 0;
          for (let j = 0; j < m; j++) {
            const q = 3 * faces.nodes[a + j]!;
            tri[0] += pts[q]! / m; tri[1] += pts[q + 1]! / m; tri[2] += pts[q + 2]! / m; tri[3] += P[o2 + j]! / m;
            if (T) { tri[4] += T[3 * (o2 + j)]! / m; tri[5] += T[3 * (o2 + j) + 1]! / m; tri[6] += T[3 * (o2 + j) + 2]! / m; }
          }
          continue;
        }
        const j = m === 3 ? v : (v === 1 ? t : (t + 1 === m ? 0 : t + 1));
        const q = 3 * faces.nodes[a + j]!;
        tri[base] = pts[q]!; tri[base + 1] = pts[q + 1]!; tri[base + 2] = pts[q + 2]!; tri[base + 3] = P[o2 + j]!;
        tri[base + 4] = T ? T[3 * (o2 + j)]! : 0; tri[base + 5] = T ? T[3 * (o2 + j) + 1]! : 0; tri[base + 6] = T ? T[3 * (o2 + j) + 2]! : 0;
      }
      addTriangle(ax, ay, az, lo, width, bins, sums);
    }
  }
  const pressure = new Float64Array(3 * bins), viscous = T ? new Float64Array(3 * bins) : null, total = new Float64Array(3 * bins);
  const dragPerLength = new Float64Array(bins), cumulativeDrag = new Float64Array(bins + 1), edges = new Float64Array(bins + 1);
  for (let b = 0; b <= bins; b++) edges[b] = lo + b * width;
  edges[bins] = hi;
  for (let b = 0; b < bins; b++) {
    for (let c = 0; c < 3; c++) {
      pressure[3 * b + c] = sums[6 * b + c]! / width;
      if (viscous) viscous[3 * b + c] = sums[6 * b + 3 + c]! / width;
      total[3 * b + c] = (sums[6 * b + c]! + sums[6 * b + 3 + c]!) / width;
    }
    dragPerLength[b] = total[3 * b]! * drag[0] + total[3 * b + 1]! * drag[1] + total[3 * b + 2]! * drag[2];
    cumulativeDrag[b + 1] = cumulativeDrag[b]! + dragPerLength[b]! * width;
  }
  const x = 6 * bins;
  const outside: Vec3 = [sums[x]! + sums[x + 3]!, sums[x + 1]! + sums[x + 4]!, sums[x + 2]! + sums[x + 5]!];
  return { axis: [ax, ay, az], dragDirection: drag, edges, pressure, viscous, total, dragPerLength, cumulativeDrag, outside, split: 'exact' };
}

/** Distributes the triangle in `tri` over the bins (clipping when it spans several); parts outside go to bin `bins`. */
function addTriangle(ax: number, ay: number, az: number, lo: number, width: number, bins: number, sums: Float64Array): void {
  let smin = Infinity, smax = -Infinity;
  for (let v = 0; v < 3; v++) {
    const s = tri[V * v]! * ax + tri[V * v + 1]! * ay + tri[V * v + 2]! * az;
    if (s < smin) smin = s; if (s > smax) smax = s;
  }
  const hi = lo + bins * width;
  const b0 = Math.floor((smin - lo) / width), b1 = Math.floor((smax - lo) / width);
  if (b0 === b1 && b0 >= 0 && b0 < bins) { integratePolygon(tri, 3, sums, b0); return; }
  if (polyA.length < V * 8) { polyA = new Float64Array(V * 8); polyB = new Float64Array(V * 8); }
  // Inside parts, bin by bin.
  for (let b = Math.max(0, b0); b <= Math.min(bins - 1, b1); b++) {
    const e0 = lo + b * width, e1 = b === bins - 1 ? hi : lo + (b + 1) * width;
    let n = clip(tri, 3, polyA, ax, ay, az, e0, 1);
    if (n < 3) continue;
    n = clip(polyA, n, polyB, ax, ay, az, e1, -1);
    if (n >= 3) integratePolygon(polyB, n, sums, b);
  }
  // Outside parts: below the range and above it.
  if (smin < lo) { const n = clip(tri, 3, polyA, ax, ay, az, lo, -1); if (n >= 3) integratePolygon(polyA, n, sums, bins); }
  if (smax > hi) { const n = clip(tri, 3, polyA, ax, ay, az, hi, 1); if (n >= 3) integratePolygon(polyA, n, sums, bins); }
}
