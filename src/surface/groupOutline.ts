/**
 * The outline of every surface group: the face edges where a group ends (it meets another group, or the
 * surface is open there), as line segments the view draws around a selected group. A closed group (a
 * sphere wall) has none; the view marks it by its rim instead.
 *
 * One edge adjacency over all boundary faces (`faceEdges`): a corner's edge is on its face's group outline
 * when one face uses it, three or more do (non-manifold), or its two faces lie in different groups. An
 * edge between two groups is listed once for each.
 */
import type { Dataset } from '../model/dataset.ts';
import type { BoundaryFaces } from './boundaryFaces.ts';
import { faceEdges } from './faceEdges.ts';

/** Outline segments: `positions` 6 per segment (xyz of both ends, length unit), `groups` the group index per segment. */
export interface GroupOutline {
  positions: Float32Array;
  groups: Int32Array;
}

/** The outline segments of every group (`faceGroup[f]` is boundary face f's group index). */
export function groupOutline(d: Dataset, faces: BoundaryFaces, faceGroup: Int32Array): GroupOutline {
  const e = faceEdges(faces);
  const offs = faces.offsets, nodes = faces.nodes, uses = e.uses, f0 = e.face0, f1 = e.face1, ce = e.cornerEdge;
  const onOutline = (k: number): boolean => {
    const x = ce[k]!, u = uses[x]!;
    return u !== 2 || faceGroup[f0[x]!] !== faceGroup[f1[x]!];
  };
  let n = 0;
  for (let k = 0; k < ce.length; k++) if (onOutline(k)) n++;
  const positions = new Float32Array(6 * n), groups = new Int32Array(n);
  let s = 0;
  for (let f = 0; f < faces.count; f++) {
    const a = offs[f]!, m = offs[f + 1]! - a, P = d.pieces[faces.piece[f]!]!.points, g = faceGroup[f]!;
    for (let j = 0; j < m; j++) {
      // corners are numbered face by face, so corner a + j of face f is corner a + j of the whole list
      if (!onOutline(a + j)) continue;
      const p = 3 * nodes[a + j]!, q = 3 * nodes[a + (j + 1 === m ? 0 : j + 1)]!, o = 6 * s;
      positions[o] = P[p]!; positions[o + 1] = P[p + 1]!; positions[o + 2] = P[p + 2]!;
      positions[o + 3] = P[q]!; positions[o + 4] = P[q + 1]!; positions[o + 5] = P[q + 2]!;
      groups[s++] = g;
    }
  }
  return { positions, groups };
}
