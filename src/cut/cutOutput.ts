/**
 * The output of one cut while it is being made: vertices (position, provenance edge as two global point ids,
 * parameter t) and triangles (three vertex indices, source cell), in module-level buffers that grow and never
 * shrink. Both per-cell paths of the cut — the case tables (`tableCut.ts`) and the general polygon builder
 * (`cutPlane.ts`) — write their polygons through `writePolygon`, so a polygon is oriented, triangulated and
 * stored by the same arithmetic whichever path found it.
 */
import { fillPolygon } from './polygonFill.ts';

/** Vertices and triangles the buffers hold at first (they grow as a cut needs). */
const START = 4096;
let oPos: Float64Array, oEdge: Int32Array, oT: Float64Array, oIdx: Uint32Array, oCell: Int32Array;
/** Fresh buffers of `START` vertices and triangles (at load, and after a cut took the buffers themselves). */
function startBuffers(): void {
  oPos = new Float64Array(3 * START); oEdge = new Int32Array(2 * START); oT = new Float64Array(START);
  oIdx = new Uint32Array(3 * START); oCell = new Int32Array(START);
}
startBuffers();
let nV = 0, nT = 0;
let tri = new Int32Array(192), work = new Int32Array(64);

/** Whether the last cut was given views of the buffers themselves (`takeOutput(true)`) and has not given them back. */
let lent = false;

/** Starts a new cut's output, with room for about `verts` vertices and `tris` triangles. */
export function resetOutput(verts: number, tris: number): void {
  // A lent cut may still be read: leave it its buffers.
  if (lent) { startBuffers(); lent = false; }
  nV = 0; nT = 0;
  reserveOutput(verts, tris);
}

/** Makes room for `verts` more vertices and `tris` more triangles. */
export function reserveOutput(verts: number, tris: number): void {
  if (nV + verts > oT.length) {
    const n = Math.max(2 * oT.length, nV + verts);
    const p = new Float64Array(3 * n); p.set(oPos.subarray(0, 3 * nV)); oPos = p;
    const e = new Int32Array(2 * n); e.set(oEdge.subarray(0, 2 * nV)); oEdge = e;
    const t = new Float64Array(n); t.set(oT.subarray(0, nV)); oT = t;
  }
  if (nT + tris > oCell.length) {
    const n = Math.max(2 * oCell.length, nT + tris);
    const i = new Uint32Array(3 * n); i.set(oIdx.subarray(0, 3 * nT)); oIdx = i;
    const c = new Int32Array(n); c.set(oCell.subarray(0, nT)); oCell = c;
  }
}

/** Triangles written so far in this cut. */
export function triangleTotal(): number { return nT; }

/** Vertices written so far in this cut. */
export function vertexTotal(): number { return nV; }

/** Below this many vertices a cut's arrays are copied out of the buffers, which stay for the next cut. */
const HAND_OVER_MIN = 1 << 15;

/**
 * Gives the buffers back from a cut that was lent them (`takeOutput(true)`, `positions` its array), so the next
 * cut writes into them again instead of fresh memory. Nothing for any other cut.
 */
export function returnOutput(positions: Float64Array): void {
  if (lent && positions.buffer === oPos.buffer) lent = false;
}

/**
 * The cut's arrays (see `PlaneCut` for their layout). `lend`: views of the buffers themselves, valid until
 * the next cut starts, or, once given back with `returnOutput`, until the next cut writes (a pool worker's cut,
 * which lives only until it is copied into the merged arrays: no fresh memory a cut, no copy). A large cut that fills at least half of the buffers
 * gets the buffers themselves (views of their used part; the next cut makes new ones): copying them would
 * write as many fresh bytes again, which on a first cut of millions of cells cost more than the cut itself
 * (fresh pages are slow to touch on a virtual machine). A small cut gets copies and the buffers stay.
 */
export function takeOutput(lend = false): { positions: Float64Array; indices: Uint32Array; sourceCell: Int32Array; vertexEdges: Int32Array; vertexT: Float64Array } {
  if (lend) {
    lent = true;
    return {
      positions: oPos.subarray(0, 3 * nV), indices: oIdx.subarray(0, 3 * nT), sourceCell: oCell.subarray(0, nT),
      vertexEdges: oEdge.subarray(0, 2 * nV), vertexT: oT.subarray(0, nV),
    };
  }
  if (nV >= HAND_OVER_MIN && 2 * nV >= oT.length && 2 * nT >= oCell.length) {
    const out = {
      positions: oPos.subarray(0, 3 * nV), indices: oIdx.subarray(0, 3 * nT), sourceCell: oCell.subarray(0, nT),
      vertexEdges: oEdge.subarray(0, 2 * nV), vertexT: oT.subarray(0, nV),
    };
    startBuffers();
    nV = 0; nT = 0;
    return out;
  }
  return {
    positions: oPos.slice(0, 3 * nV), indices: oIdx.slice(0, 3 * nT), sourceCell: oCell.slice(0, nT),
    vertexEdges: oEdge.slice(0, 2 * nV), vertexT: oT.slice(0, nV),
  };
}

/**
 * Orients the polygon `loop[0 … m−1]` (indices into the vertex arrays xs, ys, zs; edge ends `va`, `vb` as
 * piece point ids, parameter `vt`) counter-clockwise about the unit normal n (in place), triangulates it and
 * writes it out for `cell`, adding `pointBase` to the point ids. Returns false for a polygon of zero area
 * (nothing written). `loop` must hold room for m entries.
 */
export function writePolygon(xs: Float64Array, ys: Float64Array, zs: Float64Array, va: Int32Array, vb: Int32Array, vt: Float64Array,
  loop: Int32Array, m: number, nx: number, ny: number, nz: number, cell: number, pointBase: number): boolean {
  if (m < 3) return false;
  const x0 = xs[loop[0]!]!, y0 = ys[loop[0]!]!, z0 = zs[loop[0]!]!;
  let area2 = 0;
  for (let i = 1; i < m - 1; i++) {
    const a = loop[i]!, b = loop[i + 1]!;
    const ax = xs[a]! - x0, ay = ys[a]! - y0, az = zs[a]! - z0, bx = xs[b]! - x0, by = ys[b]! - y0, bz = zs[b]! - z0;
    area2 += nx * (ay * bz - az * by) + ny * (az * bx - ax * bz) + nz * (ax * by - ay * bx);
  }
  if (area2 === 0) return false;
  if (area2 < 0) for (let i = 0, j = m - 1; i < j; i++, j--) { const s = loop[i]!; loop[i] = loop[j]!; loop[j] = s; }
  if (tri.length < 3 * m) { tri = new Int32Array(6 * m); work = new Int32Array(2 * m); }
  const nt = fillPolygon(xs, ys, zs, loop, m, nx, ny, nz, tri, work);
  reserveOutput(m, nt);
  // The buffers in locals once they have room (module-level `let`s are read through their context at every use).
  const pos = oPos, edge = oEdge, par = oT, idx = oIdx, cellOf = oCell, tr = tri, base = nV, t0 = nT;
  for (let i = 0; i < m; i++) {
    const v = loop[i]!, o = base + i;
    pos[3 * o] = xs[v]!; pos[3 * o + 1] = ys[v]!; pos[3 * o + 2] = zs[v]!;
    edge[2 * o] = pointBase + va[v]!; edge[2 * o + 1] = pointBase + vb[v]!; par[o] = vt[v]!;
  }
  for (let t = 0; t < nt; t++) {
    const o = t0 + t;
    idx[3 * o] = base + tr[3 * t]!; idx[3 * o + 1] = base + tr[3 * t + 1]!; idx[3 * o + 2] = base + tr[3 * t + 2]!;
    cellOf[o] = cell;
  }
  nV = base + m; nT = t0 + nt;
  return true;
}
