/**
 * wallNodes keeps the last wall it made (a wall's gradient is primed, then its traction computed, both asking for
 * the same wall): the same wall asked again gets it back; a selection written over in place, other faces or
 * another node count get fresh nodes, equal to those of a first request.
 */
import { describe, expect, it } from 'vitest';
import { datasetOf, hexGrid } from '../../src/model/meshBuild.ts';
import { getBoundaryFaces } from '../../src/surface/surfaceCache.ts';
import { wallNodes, type WallNodes } from '../../src/surface/wallTraction.ts';
import type { BoundaryFaces } from '../../src/surface/boundaryFaces.ts';
import type { Dataset } from '../../src/model/dataset.ts';

function cornerOffsets(faces: BoundaryFaces, sel: Int32Array): Int32Array {
  const off = new Int32Array(sel.length + 1);
  for (let k = 0; k < sel.length; k++) off[k + 1] = off[k]! + faces.offsets[sel[k]! + 1]! - faces.offsets[sel[k]!]!;
  return off;
}

/** The wall nodes made from nothing (the cache emptied by a request for another wall first). */
function fresh(d: Dataset, faces: BoundaryFaces, sel: Int32Array): WallNodes {
  const other = Int32Array.of(faces.piece.length - 1);
  wallNodes(d, faces, other, cornerOffsets(faces, other));
  return wallNodes(d, faces, sel, cornerOffsets(faces, sel));
}

describe('wallNodes reuse', () => {
  const d = datasetOf([hexGrid(4, 3, 2)], 'box'), faces = getBoundaryFaces(d);

  it('the same wall again: the same nodes; a selection changed in place: nodes made anew', () => {
    const sel = Int32Array.from({ length: 10 }, (_, i) => i), off = cornerOffsets(faces, sel);
    const a = wallNodes(d, faces, sel, off);
    expect(wallNodes(d, faces, Int32Array.from(sel), off)).toBe(a);
    sel.reverse();
    const b = wallNodes(d, faces, sel, cornerOffsets(faces, sel));
    expect(b).not.toBe(a);
    const want = fresh(d, faces, Int32Array.from(sel));
    expect(Array.from(b.perPiece[0]!)).toEqual(Array.from(want.perPiece[0]!));
    expect(Array.from(b.cornerRow)).toEqual(Array.from(want.cornerRow));
    // the reversed order lists the nodes in another order than the first request's
    expect(Array.from(b.perPiece[0]!)).not.toEqual(Array.from(a.perPiece[0]!));
  });

  it('other boundary faces (another mesh of the same size): nodes made anew', () => {
    const d2 = datasetOf([hexGrid(4, 3, 2)], 'box 2'), faces2 = getBoundaryFaces(d2);
    const sel = Int32Array.of(0, 1, 2), a = wallNodes(d, faces, sel, cornerOffsets(faces, sel));
    expect(wallNodes(d2, faces2, sel, cornerOffsets(faces2, sel))).not.toBe(a);
  });
});
