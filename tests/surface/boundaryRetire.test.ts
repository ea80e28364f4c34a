/**
 * Retiring final faces from the face table (src/surface/faceRetire.ts) changes only the speed of boundary
 * extraction: with retirement after every face (`retireAbove: 1`) the boundary faces, their order, nodes,
 * merged points, areas and centroids are exactly those without it (these small meshes never reach the default
 * threshold) — on every volume cell type, polyhedra included, in one piece and in pieces matched by
 * coordinates, listed in both orders. The whole boundary of a unit cube has area 6 either way.
 */
import { describe, expect, it } from 'vitest';
import { datasetOf } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { subPiece } from '../../src/pieces/subPiece.ts';
import { boundaryFaces, totalArea, type BoundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { meshesOfEveryType } from '../locate/meshes.ts';

function slabs(p: Piece, n: number): Piece[] {
  const lists: number[][] = Array.from({ length: n }, () => []);
  for (let c = 0; c < p.cellTypes.length; c++) {
    let z = 0;
    for (let q = p.offsets[c]!; q < p.offsets[c + 1]!; q++) z += p.points[3 * p.connectivity[q]! + 2]!;
    lists[Math.min(n - 1, Math.floor((z / (p.offsets[c + 1]! - p.offsets[c]!)) * n))]!.push(c);
  }
  return lists.map((cells) => subPiece(p, Int32Array.from(cells), new Float64Array(0)).piece);
}

const arrays = (f: BoundaryFaces) => [f.count, f.flipped, f.cells3d, f.cell, f.localFace, f.piece, f.offsets, f.nodes, f.points, f.areaVector, f.centroid];

describe('boundary extraction with final faces retired early', () => {
  for (const { name, dataset } of meshesOfEveryType(6)) {
    it(`${name}: the same faces in one piece and in pieces`, () => {
      const p = dataset.pieces[0]!;
      for (const d of [dataset, datasetOf(slabs(p, 3)), datasetOf(slabs(p, 3).reverse())]) {
        const plain = boundaryFaces(d), early = boundaryFaces(d, { retireAbove: 1 });
        expect(arrays(early)).toEqual(arrays(plain));
        if (name !== 'voxel') expect(totalArea(early)).toBeCloseTo(6, 12);
      }
    });
  }
});
