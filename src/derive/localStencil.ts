/**
 * The point stencil of `stencils.ts` (nodes sharing a cell with a node) for a few nodes only: the rows of
 * the chosen nodes and of their neighbours — every row a one-ring or two-ring fit at the chosen nodes
 * reads — each holding exactly what `pointStencil` gives for it, in the same order; every other row is
 * empty.
 *
 * The node → cells incidence is built for those rows' nodes only (two marking scans of the connectivity,
 * then a count and a fill that write for the marked nodes alone), so the cost beyond a read of the
 * connectivity is proportional to the chosen nodes: the wall nodes of a large mesh, or the node range one
 * worker of the pool fits (src/parallel/deriveShares.ts) — no worker builds the whole mesh's incidence.
 *
 * Indices are local to one piece; the result is a `Stencil` over all the piece's points.
 */
import type { Piece } from '../model/piece.ts';
import type { Stencil } from './stencils.ts';

interface Incidence { cs: Int32Array; cells: Int32Array; stamp: Int32Array }

/** Node marks: 1 a chosen node, 2 a neighbour of one (shares a cell with it), 0 neither. */
const CHOSEN = 1, NEIGHBOUR = 2;

/** Marks NEIGHBOUR every unmarked node of every cell that holds a CHOSEN node. */
function markNeighbours(p: Piece, mark: Uint8Array): void {
  const conn = p.connectivity, off = p.offsets, nc = p.cellTypes.length;
  for (let c = 0, a = off[0]!; c < nc; c++) {
    const b = off[c + 1]!;
    let touches = false;
    for (let k = a; k < b; k++) if (mark[conn[k]!] === CHOSEN) { touches = true; break; }
    if (touches) for (let k = a; k < b; k++) { const q = conn[k]!; if (mark[q] === 0) mark[q] = NEIGHBOUR; }
    a = b;
  }
}

/**
 * Node → cells incidence (CSR over all the piece's points, cells ascending as in stencils.ts) holding the
 * lists of the marked nodes only; an unmarked node's list is empty. With a fresh stamp for `walkRow`.
 */
function incidenceOfMarked(p: Piece, mark: Uint8Array): Incidence {
  const np = mark.length, conn = p.connectivity, off = p.offsets, nc = p.cellTypes.length;
  const cs = new Int32Array(np + 1);
  for (let k = 0; k < conn.length; k++) { const q = conn[k]!; if (mark[q]) cs[q + 1]!++; }
  for (let i = 0; i < np; i++) cs[i + 1]! += cs[i]!;
  const fill = cs.slice(0, np), cells = new Int32Array(cs[np]!);
  for (let c = 0, a = off[0]!; c < nc; c++) {
    const b = off[c + 1]!;
    for (let k = a; k < b; k++) { const q = conn[k]!; if (mark[q]) cells[fill[q]!++] = c; }
    a = b;
  }
  return { cs, cells, stamp: new Int32Array(np).fill(-1) };
}

/**
 * Walks the row of node i (the nodes of its cells, cells ascending, nodes in connectivity order, i and
 * repeats left out): writes them to `out` from `at` when given; returns the row's length. `stamp` must
 * not hold i from an earlier walk.
 */
function walkRow(p: Piece, inc: Incidence, i: number, out: Int32Array | null, at: number): number {
  const { cs, cells, stamp } = inc, conn = p.connectivity, off = p.offsets;
  let n = 0;
  stamp[i] = i;
  for (let a = cs[i]!; a < cs[i + 1]!; a++) {
    const c = cells[a]!;
    for (let b = off[c]!; b < off[c + 1]!; b++) {
      const q = conn[b]!;
      if (stamp[q] === i) continue;
      stamp[q] = i;
      if (out) out[at + n] = q;
      n++;
    }
  }
  return n;
}

/**
 * The rows of every marked node, each walked once, in node order, straight into fresh compressed rows (room
 * for a row's most entries made before its walk, so the inner loop never checks capacity).
 */
function rowsOfMarked(p: Piece, mark: Uint8Array, inc: Incidence, marked: number): Stencil {
  const np = mark.length, offsets = new Int32Array(np + 1), conn = p.connectivity, off = p.offsets, { cs, cells, stamp } = inc;
  // a hexahedral lattice node has 26 neighbours, a tetrahedral one about 14
  let ids = new Int32Array(Math.max(64, 27 * marked)), n = 0;
  for (let i = 0; i < np; i++) {
    if (mark[i]) {
      const ca = cs[i]!, cb = cs[i + 1]!;
      let most = 0;
      for (let a = ca; a < cb; a++) { const c = cells[a]!; most += off[c + 1]! - off[c]!; }
      if (n + most > ids.length) { const g = new Int32Array(Math.max(2 * ids.length, n + most)); g.set(ids.subarray(0, n)); ids = g; }
      stamp[i] = i;
      for (let a = ca; a < cb; a++) {
        const c = cells[a]!, hi = off[c + 1]!;
        for (let b = off[c]!; b < hi; b++) {
          const q = conn[b]!;
          if (stamp[q] === i) continue;
          stamp[q] = i;
          ids[n++] = q;
        }
      }
    }
    offsets[i + 1] = n;
  }
  // keep the buffer when little of it is unused (a copy costs more than the slack)
  return { offsets, ids: n >= 0.8 * ids.length ? ids.subarray(0, n) : ids.slice(0, n) };
}

/** Rows of `pointStencil(p)` for `nodes` and their neighbours (see the file comment). */
export function pointStencilAround(p: Piece, nodes: Int32Array): Stencil {
  const mark = new Uint8Array(p.points.length / 3);
  for (let k = 0; k < nodes.length; k++) mark[nodes[k]!] = CHOSEN;
  markNeighbours(p, mark);
  let marked = 0;
  for (let i = 0; i < mark.length; i++) if (mark[i]) marked++;
  return rowsOfMarked(p, mark, incidenceOfMarked(p, mark), marked);
}

/**
 * Rows of `pointStencil(p)` for the nodes `from .. to-1` and for their neighbours outside that range (every
 * row a one-ring or two-ring fit of a node in the range reads), each exactly as `pointStencil` gives it;
 * every other row is empty. The range's rows are walked once, straight into place (inline: the hot loop),
 * for the node ranges the worker pool splits a gradient into; the cost is proportional to the range's
 * nodes beyond two reads of the connectivity.
 */
export function pointStencilOfRange(p: Piece, from: number, to: number): Stencil {
  const np = p.points.length / 3, conn = p.connectivity, off = p.offsets;
  const mark = new Uint8Array(np);
  mark.fill(CHOSEN, from, to);
  markNeighbours(p, mark);
  const inc = incidenceOfMarked(p, mark), { cs, cells, stamp } = inc;
  // the neighbours' row lengths, below and above the range (a thin layer around it)
  const offsets = new Int32Array(np + 1);
  let below = 0, above = 0;
  for (let i = 0; i < np; i++) {
    if (mark[i] !== NEIGHBOUR) continue;
    const m = walkRow(p, inc, i, null, 0);
    offsets[i + 1] = m;
    if (i < from) below += m; else above += m;
  }
  stamp.fill(-1);
  // the range's rows, in node order, each walked once from `below` on
  let rows = new Int32Array(below + Math.max(64, 27 * (to - from)) + above), n = below;
  for (let i = from; i < to; i++) {
    const ca = cs[i]!, cb = cs[i + 1]!;
    let most = 0;
    for (let a = ca; a < cb; a++) { const c = cells[a]!; most += off[c + 1]! - off[c]!; }
    if (n + most + above > rows.length) { const g = new Int32Array(Math.max(2 * rows.length, n + most + above)); g.set(rows.subarray(0, n)); rows = g; }
    const start = n;
    stamp[i] = i;
    for (let a = ca; a < cb; a++) {
      const c = cells[a]!, hi = off[c + 1]!;
      for (let b = off[c]!; b < hi; b++) {
        const q = conn[b]!;
        if (stamp[q] === i) continue;
        stamp[q] = i;
        rows[n++] = q;
      }
    }
    offsets[i + 1] = n - start;
  }
  for (let i = 0; i < np; i++) offsets[i + 1]! += offsets[i]!;
  if (below + above === 0) return { offsets, ids: rows.subarray(0, n) };
  // the neighbours' rows, into their places below and above the range's
  stamp.fill(-1);
  for (let i = 0; i < np; i++) if (mark[i] === NEIGHBOUR) walkRow(p, inc, i, rows, offsets[i]!);
  return { offsets, ids: rows.subarray(0, n + above) };
}
