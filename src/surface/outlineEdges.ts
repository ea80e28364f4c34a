/**
 * The face outlines of a drawn surface, each edge once per surface group. On a closed surface every edge
 * belongs to two faces, so listing each face's outline would draw every line twice; a software rasteriser
 * pays for each. An edge between two groups stays once for each (hiding one group keeps the other's
 * outline). `shares` keeps how many faces of the group listed the edge, so the view can draw a shared edge
 * exactly as dark as two overlaid translucent lines were (the picture does not change).
 */
import type { Dataset } from '../model/dataset.ts';

/** Outline segments: xyz pairs (m), with the group and the number of faces sharing the edge at each end. */
export interface OutlineEdges {
  /** 6 per segment: both ends' xyz. */
  edges: Float32Array;
  /** 2 per segment: the group id at each end (float, for the shader). */
  edgeGroups: Float32Array;
  /** 2 per segment: faces of that group listing the edge (1 on a rim, 2 inside a closed part). */
  edgeShares: Float32Array;
}

/** Faces as `drawFaces` takes them: offsets into piece-local node ids, and each face's piece. */
interface FaceNodes {
  readonly count: number;
  readonly offsets: Int32Array;
  readonly nodes: Int32Array;
  readonly piece: Int32Array;
}

/** `groupOfFace[f]` is face f's group (0 when absent). Every array returned is new. */
export function outlineEdges(d: Dataset, f: FaceNodes, groupOfFace: Int32Array | null): OutlineEdges {
  const total = f.offsets[f.count]! - f.offsets[0]!;
  // open addressing over kept edges; the table is at least twice the edges listed
  let size = 1024;
  while (size < 2 * total) size *= 2;
  const mask = size - 1, table = new Int32Array(size).fill(-1);
  const keptLo = new Int32Array(total), keptHi = new Int32Array(total), keptPiece = new Int32Array(total), keptGroup = new Int32Array(total);
  const keptShares = new Int32Array(total);
  let kept = 0;
  for (let i = 0; i < f.count; i++) {
    const a = f.offsets[i]!, m = f.offsets[i + 1]! - a, k = f.piece[i]!, g = groupOfFace ? groupOfFace[i]! : 0;
    for (let j = 0; j < m; j++) {
      const n0 = f.nodes[a + j]!, n1 = f.nodes[a + ((j + 1) % m)]!;
      const lo = n0 < n1 ? n0 : n1, hi = n0 < n1 ? n1 : n0;
      let h = (Math.imul(lo, 0x9e3779b1) ^ Math.imul(hi, 0x85ebca77) ^ Math.imul(g + 1, 0xc2b2ae3d) ^ Math.imul(k + 1, 0x27d4eb2f)) & mask;
      for (;;) {
        const e = table[h]!;
        if (e < 0) {
          table[h] = kept;
          keptLo[kept] = lo; keptHi[kept] = hi; keptPiece[kept] = k; keptGroup[kept] = g; keptShares[kept] = 1;
          kept++;
          break;
        }
        if (keptLo[e] === lo && keptHi[e] === hi && keptGroup[e] === g && keptPiece[e] === k) { keptShares[e]!++; break; }
        h = (h + 1) & mask;
      }
    }
  }
  const edges = new Float32Array(6 * kept), edgeGroups = new Float32Array(2 * kept), edgeShares = new Float32Array(2 * kept);
  for (let e = 0; e < kept; e++) {
    const P = d.pieces[keptPiece[e]!]!.points, p0 = 3 * keptLo[e]!, p1 = 3 * keptHi[e]!, o = 6 * e;
    edges[o] = P[p0]!; edges[o + 1] = P[p0 + 1]!; edges[o + 2] = P[p0 + 2]!;
    edges[o + 3] = P[p1]!; edges[o + 4] = P[p1 + 1]!; edges[o + 5] = P[p1 + 2]!;
    edgeGroups[2 * e] = edgeGroups[2 * e + 1] = keptGroup[e]!;
    edgeShares[2 * e] = edgeShares[2 * e + 1] = keptShares[e]!;
  }
  return { edges, edgeGroups, edgeShares };
}
