/**
 * Neighbourhoods for gradient reconstruction, as compressed rows (CSR): row `i` lists the entries
 * `ids[offsets[i] .. offsets[i+1]-1]`.
 *
 *  - Point stencil: the nodes that share a cell with node `i` (every node of every cell around it, not
 *    only its edges: a hexahedral node gets its 26 lattice neighbours, enough for a quadratic fit).
 *  - Cell stencil: the cells that share a node with cell `c`, fitted at cell centroids (vertex means).
 *
 * Indices are local to one piece.
 */
import type { Piece } from '../model/piece.ts';

/** Compressed rows of neighbour indices. */
export interface Stencil {
  readonly offsets: Int32Array;
  readonly ids: Int32Array;
}

/** Point → cells incidence (CSR over the piece's points). */
function pointCells(p: Piece): Stencil {
  const np = p.points.length / 3, conn = p.connectivity, nc = p.cellTypes.length, off = p.offsets;
  const count = new Int32Array(np + 1);
  for (let k = 0; k < conn.length; k++) count[conn[k]! + 1]!++;
  for (let i = 0; i < np; i++) count[i + 1]! += count[i]!;
  const fill = count.slice(0, np), ids = new Int32Array(conn.length);
  for (let c = 0, a = off[0]!; c < nc; c++) {
    const b = off[c + 1]!;
    for (let k = a; k < b; k++) ids[fill[conn[k]!]!++] = c;
    a = b;
  }
  return { offsets: count, ids };
}

/**
 * Rows of the union of `second(j)` over the entries `j` of `first(i)`, without `i` itself and without
 * repeats, in order of first appearance. Plain typed arrays in, so the loop sees one shape.
 */
function unionRows(n: number, firstOff: Int32Array, firstIds: Int32Array, secondOff: Int32Array, secondIds: Int32Array,
  marks: number, guess: number): Stencil {
  const stamp = new Int32Array(marks).fill(-1);
  let ids = new Int32Array(Math.max(16, guess));
  const offsets = new Int32Array(n + 1);
  let o = 0;
  for (let i = 0; i < n; i++) {
    if (i < marks) stamp[i] = i;
    const fa = firstOff[i]!, fb = firstOff[i + 1]!;
    // room for every entry this row could add, so the inner loop never checks capacity
    let most = 0;
    for (let a = fa; a < fb; a++) { const j = firstIds[a]!; most += secondOff[j + 1]! - secondOff[j]!; }
    if (o + most > ids.length) { const grown = new Int32Array(Math.max(2 * ids.length, o + most)); grown.set(ids.subarray(0, o)); ids = grown; }
    for (let a = fa; a < fb; a++) {
      const j = firstIds[a]!, hi = secondOff[j + 1]!;
      for (let b = secondOff[j]!; b < hi; b++) {
        const q = secondIds[b]!;
        if (stamp[q] === i) continue;
        stamp[q] = i;
        ids[o++] = q;
      }
    }
    offsets[i + 1] = o;
  }
  // keep the buffer when little of it is unused (a copy of ~100 MB costs more than the slack)
  return { offsets, ids: o >= 0.8 * ids.length ? ids.subarray(0, o) : ids.slice(0, o) };
}

/** Nodes sharing a cell with each node (see the file comment). */
export function pointStencil(p: Piece): Stencil {
  const np = p.points.length / 3, pc = pointCells(p);
  // a hexahedral lattice node has 26 neighbours, a tetrahedral one about 14
  return unionRows(np, pc.offsets, pc.ids, p.offsets, p.connectivity, np, 27 * np);
}

/** Cells sharing a node with each cell. */
export function cellStencil(p: Piece): Stencil {
  const pc = pointCells(p), nc = p.cellTypes.length;
  // cell → its nodes is the piece's own connectivity; each node → its cells is `pc`
  return unionRows(nc, p.offsets, p.connectivity, pc.offsets, pc.ids, nc, 27 * nc);
}

/** Cell centroids (vertex means), xyz interleaved (length unit). */
export function cellCentres(p: Piece): Float64Array {
  const nc = p.cellTypes.length, out = new Float64Array(3 * nc), pts = p.points, conn = p.connectivity, off = p.offsets;
  for (let c = 0; c < nc; c++) {
    const a = off[c]!, m = off[c + 1]! - a;
    let x = 0, y = 0, z = 0;
    for (let k = a; k < a + m; k++) { const q = 3 * conn[k]!; x += pts[q]!; y += pts[q + 1]!; z += pts[q + 2]!; }
    out[3 * c] = x / m; out[3 * c + 1] = y / m; out[3 * c + 2] = z / m;
  }
  return out;
}
