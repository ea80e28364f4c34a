/**
 * The footprint of a probe set on one task's pieces: the cells its probes can touch, so that a dataset
 * assembled from every task's footprint (`assemble.ts`) gives each probe exactly the numbers the whole set
 * gives. Per piece, a cell is kept when it is
 *  - not a volume cell (surface cells carry group arrays; they are few);
 *  - a volume cell owning a face on the boundary of the task's pieces (forces, surface fluxes, surface
 *    groups and the report's picture need the whole boundary; faces between two tasks' pieces are kept by
 *    both tasks and matched in the assembled dataset, so they are not boundary there);
 *  - a volume cell whose bounding box reaches a probe's plane (cut-plane, both planes of a pressure loss,
 *    every plane of a mass balance), within `planeMargin × the task's bounds diagonal`, so cells touching
 *    the plane at a node or a face are in, as the on-plane rule of `cutPlane.ts` needs;
 *  - a volume cell whose bounding box, grown by `boxMargin` of its own diagonal, meets a line probe's
 *    segment or holds a point probe's point (the point-location tolerance is at most 1e-4 of a cell).
 *  - every volume cell when the set has an iso-surface probe (the surface may pass through any cell);
 *  - a volume cell within two node rings of any cell above (gradient stencils of wall quantities and
 *    derived fields reach that far).
 * Keeping more cells than needed never changes a number: the cut takes only the cells the plane crosses,
 * and point location picks among the cells holding a point by the smallest violation, then the lowest
 * global cell id, an order the assembled dataset keeps (cells stay in piece and cell order).
 *
 * Geometry is the probe set's, in the file's length unit, like the pieces' points.
 */
import { cellDimension } from '../model/cellTypes.ts';
import { boundsDiagonal, datasetBounds } from '../model/bounds.ts';
import { cellStarts, type Dataset } from '../model/dataset.ts';
import { cellCount } from '../model/piece.ts';
import type { ProbeSet } from '../study/probeSet.ts';
import { boundaryFaces, FACE_SLOTS } from '../surface/boundaryFaces.ts';

/** Margins of the footprint (see the file comment). */
export interface FootprintOptions {
  /** Distance from a plane, relative to the task's bounds diagonal, within which cells are kept. Default 1e-6. */
  planeMargin: number;
  /** Growth of a cell's box for line and point probes, relative to the box diagonal. Default 1e-3. */
  boxMargin: number;
}

export const FOOTPRINT_DEFAULTS: FootprintOptions = { planeMargin: 1e-6, boxMargin: 1e-3 };

/** Cells kept and boundary faces, per piece of the task's dataset. */
export interface Footprint {
  /** Per piece, ascending local cell ids kept. */
  cells: Int32Array[];
  /** Per piece, ascending keys `localCell × FACE_SLOTS + localFace` of the task's boundary faces (local numbering of the piece as read). */
  boundary: Float64Array[];
  /** The task's bounds (file's length unit), `[xmin, xmax, ymin, ymax, zmin, zmax]`; empty (min > max) for no points. */
  bounds: [number, number, number, number, number, number];
}

interface Plane { o: [number, number, number]; n: [number, number, number] }
interface Segment { a: [number, number, number]; b: [number, number, number] }

/** Planes, segments and points of a probe set (points as zero-length segments). */
function probeGeometry(set: ProbeSet): { planes: Plane[]; segments: Segment[] } {
  const planes: Plane[] = [], segments: Segment[] = [];
  const plane = (p: { origin: readonly number[]; normal: readonly number[] }) => {
    const n = p.normal, len = Math.hypot(n[0]!, n[1]!, n[2]!);
    planes.push({ o: [p.origin[0]!, p.origin[1]!, p.origin[2]!], n: [n[0]! / len, n[1]! / len, n[2]! / len] });
  };
  const v = (x: readonly number[]): [number, number, number] => [x[0]!, x[1]!, x[2]!];
  for (const p of set.probes) {
    if (p.kind === 'cut-plane') plane(p.geometry);
    else if (p.kind === 'pressure-loss') { plane(p.geometry.upstream); plane(p.geometry.downstream); }
    else if (p.kind === 'mass-balance') p.geometry.planes.forEach(plane);
    else if (p.kind === 'line') segments.push({ a: v(p.geometry.from), b: v(p.geometry.to) });
    else if (p.kind === 'point') segments.push({ a: v(p.geometry.at), b: v(p.geometry.at) });
  }
  return { planes, segments };
}

/** True when the segment a→b meets the box [lo, hi] (slab test; a zero-length segment is a point). */
function segmentMeetsBox(s: Segment, lo: Float64Array, hi: Float64Array): boolean {
  let t0 = 0, t1 = 1;
  for (let j = 0; j < 3; j++) {
    const a = s.a[j]!, d = s.b[j]! - a;
    if (d === 0) { if (a < lo[j]! || a > hi[j]!) return false; continue; }
    let u = (lo[j]! - a) / d, w = (hi[j]! - a) / d;
    if (u > w) { const x = u; u = w; w = x; }
    if (u > t0) t0 = u;
    if (w < t1) t1 = w;
    if (t0 > t1) return false;
  }
  return true;
}

/** Node rings kept around every kept cell (the widest gradient stencil: two rings on boundaries). */
const STENCIL_RINGS = 2;

/** Marks every cell that shares a node with a marked cell (one ring wider). */
function growByNodes(conn: Int32Array, offs: Int32Array, pointCount: number, mark: Uint8Array): void {
  const node = new Uint8Array(pointCount);
  for (let c = 0; c < mark.length; c++) if (mark[c]) for (let q = offs[c]!; q < offs[c + 1]!; q++) node[conn[q]!] = 1;
  for (let c = 0; c < mark.length; c++) {
    if (mark[c]) continue;
    for (let q = offs[c]!; q < offs[c + 1]!; q++) if (node[conn[q]!]) { mark[c] = 1; break; }
  }
}

/** The footprint of `set` on the task's dataset `d` (see the file comment). */
export function footprint(d: Dataset, set: ProbeSet, options: Partial<FootprintOptions> = {}): Footprint {
  const o = { ...FOOTPRINT_DEFAULTS, ...options };
  const bounds = datasetBounds(d) as Footprint['bounds'];
  const { planes, segments } = probeGeometry(set);
  const everyCell = set.probes.some((p) => p.kind === 'iso');
  const marks = d.pieces.map((p) => new Uint8Array(cellCount(p)));
  const starts = cellStarts(d);
  const faces = boundaryFaces(d);
  const keys = d.pieces.map(() => [] as number[]);
  for (let f = 0; f < faces.count; f++) {
    const k = faces.piece[f]!, c = faces.cell[f]! - starts[k]!;
    marks[k]![c] = 1;
    keys[k]!.push(c * FACE_SLOTS + faces.localFace[f]!);
  }
  const margin = o.planeMargin * boundsDiagonal(bounds);
  const lo = new Float64Array(3), hi = new Float64Array(3), grownLo = new Float64Array(3), grownHi = new Float64Array(3);
  d.pieces.forEach((p, k) => {
    const mark = marks[k]!, pts = p.points, conn = p.connectivity, offs = p.offsets, types = p.cellTypes;
    for (let c = 0; c < mark.length; c++) {
      if (everyCell || cellDimension(types[c]!) !== 3) { mark[c] = 1; continue; }
      if (mark[c]) continue;
      lo.fill(Infinity); hi.fill(-Infinity);
      for (let q = offs[c]!; q < offs[c + 1]!; q++) {
        const i = 3 * conn[q]!;
        for (let j = 0; j < 3; j++) { const x = pts[i + j]!; if (x < lo[j]!) lo[j] = x; if (x > hi[j]!) hi[j] = x; }
      }
      let keep = false;
      for (const pl of planes) {
        // Range of n·(x − o) over the box: centre value ± the half-extent along n.
        let mid = 0, half = 0;
        for (let j = 0; j < 3; j++) { mid += pl.n[j]! * ((lo[j]! + hi[j]!) / 2 - pl.o[j]!); half += Math.abs(pl.n[j]!) * (hi[j]! - lo[j]!) / 2; }
        if (mid - half <= margin && mid + half >= -margin) { keep = true; break; }
      }
      if (!keep && segments.length) {
        const grow = o.boxMargin * Math.hypot(hi[0]! - lo[0]!, hi[1]! - lo[1]!, hi[2]! - lo[2]!) + margin;
        for (let j = 0; j < 3; j++) { grownLo[j] = lo[j]! - grow; grownHi[j] = hi[j]! + grow; }
        for (const s of segments) if (segmentMeetsBox(s, grownLo, grownHi)) { keep = true; break; }
      }
      if (keep) mark[c] = 1;
    }
  });
  // Gradient-based quantities (the second-order wall gradient of force totals and wall probes, derived
  // fields) fit over two rings of nodes around each node (src/derive/stencils.ts, per piece): keep every cell
  // within two node rings of a kept cell, so the assembled dataset rebuilds the same stencils.
  d.pieces.forEach((p, k) => { for (let ring = 0; ring < STENCIL_RINGS; ring++) growByNodes(p.connectivity, p.offsets, p.points.length / 3, marks[k]!); });
  const cells = marks.map((mark) => {
    let n = 0;
    for (let c = 0; c < mark.length; c++) n += mark[c]!;
    const out = new Int32Array(n);
    for (let c = 0, i = 0; c < mark.length; c++) if (mark[c]) out[i++] = c;
    return out;
  });
  return { cells, boundary: keys.map((list) => Float64Array.from(list).sort()), bounds };
}
