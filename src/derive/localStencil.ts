/**
 * The point stencil of `stencils.ts` (nodes sharing a cell with a node) for a few nodes only: the rows of
 * the chosen nodes and of their neighbours — every row a one-ring or two-ring fit at the chosen nodes
 * reads — each holding exactly what `pointStencil` gives for it, in the same order; every other row is
 * empty. For the wall nodes of a large mesh this costs two passes over the connectivity instead of the
 * whole mesh's neighbour lists.
 *
 * Indices are local to one piece; the result is a `Stencil` over all the piece's points.
 */
import type { Piece } from '../model/piece.ts';
import type { Stencil } from './stencils.ts';

interface Incidence { cs: Int32Array; cells: Int32Array; stamp: Int32Array }

/**
 * Walks the row of node i (the nodes of its cells, cells ascending, nodes in connectivity order, i and
 * repeats left out): marks them in `want` when given, writes them to `out` from `at` when given; returns
 * the row's length. `stamp` must not hold i from an earlier walk.
 */
function walkRow(p: Piece, inc: Incidence, i: number, want: Uint8Array | null, out: Int32Array | null, at: number): number {
  const { cs, cells, stamp } = inc, conn = p.connectivity, off = p.offsets;
  let n = 0;
  stamp[i] = i;
  for (let a = cs[i]!; a < cs[i + 1]!; a++) {
    const c = cells[a]!;
    for (let b = off[c]!; b < off[c + 1]!; b++) {
      const q = conn[b]!;
      if (stamp[q] === i) continue;
      stamp[q] = i;
      if (want) want[q] = 1;
      if (out) out[at + n] = q;
      n++;
    }
  }
  return n;
}

/** Rows of `pointStencil(p)` for `nodes` and their neighbours (see the file comment). */
export function pointStencilAround(p: Piece, nodes: Int32Array): Stencil {
  const np = p.points.length / 3, conn = p.connectivity, off = p.offsets, nc = p.cellTypes.length;
  // point → cells, cells ascending (as stencils.ts)
  const cs = new Int32Array(np + 1);
  for (let k = 0; k < conn.length; k++) cs[conn[k]! + 1]!++;
  for (let i = 0; i < np; i++) cs[i + 1]! += cs[i]!;
  const fill = cs.slice(0, np), cells = new Int32Array(conn.length);
  for (let c = 0; c < nc; c++) for (let k = off[c]!; k < off[c + 1]!; k++) cells[fill[conn[k]!]!++] = c;
  const inc: Incidence = { cs, cells, stamp: new Int32Array(np).fill(-1) };
  const want = new Uint8Array(np);
  for (let k = 0; k < nodes.length; k++) { want[nodes[k]!] = 1; walkRow(p, inc, nodes[k]!, want, null, 0); }
  inc.stamp.fill(-1);
  const offsets = new Int32Array(np + 1);
  for (let i = 0; i < np; i++) offsets[i + 1] = offsets[i]! + (want[i] ? walkRow(p, inc, i, null, null, 0) : 0);
  const ids = new Int32Array(offsets[np]!);
  inc.stamp.fill(-1);
  for (let i = 0; i < np; i++) if (want[i]) walkRow(p, inc, i, null, ids, offsets[i]!);
  return { offsets, ids };
}

/**
 * Rows of `pointStencil(p)` for the nodes `from .. to-1` and for their neighbours outside that range (every
 * row a one-ring or two-ring fit of a node in the range reads), each exactly as `pointStencil` gives it;
 * every other row is empty. One walk per node of the range (against three in `pointStencilAround`), for
 * the node ranges the worker pool splits a gradient into.
 */
export function pointStencilOfRange(p: Piece, from: number, to: number): Stencil {
  const np = p.points.length / 3, conn = p.connectivity, off = p.offsets, nc = p.cellTypes.length;
  const cs = new Int32Array(np + 1);
  for (let k = 0; k < conn.length; k++) cs[conn[k]! + 1]!++;
  for (let i = 0; i < np; i++) cs[i + 1]! += cs[i]!;
  const fill = cs.slice(0, np), cells = new Int32Array(conn.length);
  for (let c = 0; c < nc; c++) for (let k = off[c]!; k < off[c + 1]!; k++) cells[fill[conn[k]!]!++] = c;
  const inc: Incidence = { cs, cells, stamp: new Int32Array(np).fill(-1) };
  // the range's rows, in node order, each walked once (inline: this is the hot loop); outside neighbours marked in `want`
  const want = new Uint8Array(np), offsets = new Int32Array(np + 1), stamp = inc.stamp;
  let rows = new Int32Array(Math.max(64, 27 * (to - from))), n = 0;
  for (let i = from; i < to; i++) {
    const ca = cs[i]!, cb = cs[i + 1]!;
    let most = 0;
    for (let a = ca; a < cb; a++) { const c = cells[a]!; most += off[c + 1]! - off[c]!; }
    if (n + most > rows.length) { const g = new Int32Array(Math.max(2 * rows.length, n + most)); g.set(rows.subarray(0, n)); rows = g; }
    const start = n;
    stamp[i] = i;
    for (let a = ca; a < cb; a++) {
      const c = cells[a]!, hi = off[c + 1]!;
      for (let b = off[c]!; b < hi; b++) {
        const q = conn[b]!;
        if (stamp[q] === i) continue;
        stamp[q] = i;
        rows[n++] = q;
        if (q < from || q >= to) want[q] = 1;
      }
    }
    offsets[i + 1] = n - start;
  }
  for (let i = from; i < to; i++) want[i] = 0;
  // the neighbours' rows (a thin layer around the range), below and above it
  inc.stamp.fill(-1);
  let below = 0, above = 0;
  for (let i = 0; i < np; i++) {
    if (!want[i]) continue;
    const m = walkRow(p, inc, i, null, null, 0);
    offsets[i + 1] = m;
    if (i < from) below += m; else above += m;
  }
  for (let i = 0; i < np; i++) offsets[i + 1]! += offsets[i]!;
  // no neighbours outside (one range over the whole piece): the range's rows are the result as they stand
  if (below + above === 0) return { offsets, ids: rows.subarray(0, n) };
  const ids = new Int32Array(below + n + above);
  ids.set(rows.subarray(0, n), below);
  inc.stamp.fill(-1);
  for (let i = 0; i < np; i++) if (want[i]) walkRow(p, inc, i, null, ids, offsets[i]!);
  return { offsets, ids };
}