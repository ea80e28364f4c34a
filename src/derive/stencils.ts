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
  for (let c = 0; c < nc; c++) for (let k = off[c]!; k < off[c + 1]!; k++) ids[fill[conn[k]!]!++] = c;
  return { offsets: count, ids };
}

/** Rows of the union of `via(j)` over the entries `j` of `first(i)`, without `i` itself and without repeats. */
function unionRows(n: number, first: Stencil, second: Stencil, secondIsCells: Piece | null): Stencil {
  const stamp = new Int32Array(n).fill(-1);
  let ids = new Int32Array(Math.max(16, 8 * n));
  const offsets = new Int32Array(n + 1);
  let o = 0;
  for (let i = 0; i < n; i++) {
    stamp[i] = i;
    for (let a = first.offsets[i]!; a < first.offsets[i + 1]!; a++) {
      const j = first.ids[a]!;
      const lo = secondIsCells ? secondIsCells.offsets[j]! : second.offsets[j]!;
      const hi = secondIsCells ? secondIsCells.offsets[j + 1]! : second.offsets[j + 1]!;
      const src = secondIsCells ? secondIsCells.connectivity : second.ids;
      for (let b = lo; b < hi; b++) {
        const q = src[b]!;
        if (stamp[q] === i) continue;
        stamp[q] = i;
        if (o === ids.length) { const grown = new Int32Array(2 * ids.length); grown.set(ids); ids = grown; }
        ids[o++] = q;
      }
    }
    offsets[i + 1] = o;
  }
  return { offsets, ids: ids.slice(0, o) };
}

/** Nodes sharing a cell with each node (see the file comment). */
export function pointStencil(p: Piece): Stencil {
  return unionRows(p.points.length / 3, pointCells(p), { offsets: new Int32Array(0), ids: new Int32Array(0) }, p);
}

/** Cells sharing a node with each cell. */
export function cellStencil(p: Piece): Stencil {
  const pc = pointCells(p), nc = p.cellTypes.length;
  // cell → its nodes is the piece's own connectivity; each node → its cells is `pc`
  return unionRows(nc, { offsets: p.offsets, ids: p.connectivity }, pc, null);
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
