/**
 * Edges of a set of boundary faces, with the faces that use them: the adjacency the feature-angle grouping
 * walks and the closedness checks count.
 *
 * An edge is a pair of merged point numbers `a < b` (so edges between pieces are shared). Per edge:
 * `uses` = faces of the set that have the edge, `forward` = how many of them traverse it as a→b (a
 * consistently oriented closed surface has uses 2, forward 1), `face0`/`face1` the first two faces (boundary
 * face numbers; −1 when absent). `cornerEdge[i]` is the edge from corner i to corner i+1 of the i-th corner of
 * the set, corners listed face by face in set order.
 *
 * Method: corners are bucketed by the lower end of their edge (points renumbered compactly over the set), in
 * typed arrays; equal edges are then found within each small bucket. No hashing, sequential memory access.
 */
import type { BoundaryFaces } from './boundaryFaces.ts';

export interface FaceEdges {
  readonly count: number;
  readonly a: Int32Array;
  readonly b: Int32Array;
  readonly uses: Int32Array;
  readonly forward: Int32Array;
  readonly face0: Int32Array;
  readonly face1: Int32Array;
  /** Edge of each corner of the set (corner j of the k-th face of the set → edge from node j to node j+1). */
  readonly cornerEdge: Int32Array;
}

/** Edges of the faces in `selection` (boundary face numbers), or of all faces. */
export function faceEdges(faces: BoundaryFaces, selection?: ArrayLike<number>): FaceEdges {
  const n = selection ? selection.length : faces.count;
  const pts = faces.points, offs = faces.offsets;
  const starts = faces.merge.starts, total = starts[starts.length - 1]!;
  // Compact numbering of the set's points.
  const local = new Int32Array(total).fill(-1);
  let corners = 0, nLocal = 0;
  for (let i = 0; i < n; i++) {
    const f = selection ? selection[i]! : i;
    for (let j = offs[f]!; j < offs[f + 1]!; j++) if (local[pts[j]!]! < 0) local[pts[j]!] = nLocal++;
    corners += offs[f + 1]! - offs[f]!;
  }
  const cornerFace = new Int32Array(corners), lo = new Int32Array(corners), hi = new Int32Array(corners), fwd = new Uint8Array(corners);
  const start = new Int32Array(nLocal + 1);
  for (let i = 0, k = 0; i < n; i++) {
    const f = selection ? selection[i]! : i;
    const s = offs[f]!, m = offs[f + 1]! - s;
    for (let j = 0; j < m; j++, k++) {
      const p = pts[s + j]!, q = pts[s + (j + 1 === m ? 0 : j + 1)]!;
      const lp = local[p]!, lq = local[q]!;
      cornerFace[k] = f;
      if (p < q) { lo[k] = lp; hi[k] = lq; fwd[k] = 1; } else { lo[k] = lq; hi[k] = lp; }
      start[lo[k]! + 1]!++;
    }
  }
  for (let v = 0; v < nLocal; v++) start[v + 1] = start[v + 1]! + start[v]!;
  const bucket = new Int32Array(corners), fill = start.slice(0, nLocal);
  for (let k = 0; k < corners; k++) bucket[fill[lo[k]!]!++] = k;
  const globalOf = new Int32Array(nLocal);
  for (let g = 0; g < total; g++) if (local[g]! >= 0) globalOf[local[g]!] = g;
  const cornerEdge = new Int32Array(corners).fill(-1);
  let count = 0;
  // Edges ≤ corners; trimmed at the end.
  const a = new Int32Array(corners), b = new Int32Array(corners), uses = new Int32Array(corners), forward = new Int32Array(corners);
  const face0 = new Int32Array(corners), face1 = new Int32Array(corners);
  for (let v = 0; v < nLocal; v++) {
    for (let i = start[v]!; i < start[v + 1]!; i++) {
      const k = bucket[i]!;
      if (cornerEdge[k]! >= 0) continue;
      const e = count++, h = hi[k]!;
      a[e] = globalOf[v]!; b[e] = globalOf[h]!; face0[e] = cornerFace[k]!; face1[e] = -1;
      for (let j = i; j < start[v + 1]!; j++) {
        const c = bucket[j]!;
        if (hi[c] !== h) continue;
        cornerEdge[c] = e;
        if (uses[e] === 1) face1[e] = cornerFace[c]!;
        uses[e]!++;
        forward[e]! += fwd[c]!;
      }
    }
  }
  return {
    count, a: a.slice(0, count), b: b.slice(0, count), uses: uses.slice(0, count), forward: forward.slice(0, count),
    face0: face0.slice(0, count), face1: face1.slice(0, count), cornerEdge,
  };
}
