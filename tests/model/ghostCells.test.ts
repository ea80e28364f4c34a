/**
 * `withoutGhostCells` on small hand-made pieces: which cells go (bits 1 and 32 of `vtkGhostType`, not the
 * others), which points stay (those the kept cells use, polyhedron faces included, in their order), the
 * fields' tuples follow, the face stream of kept polyhedra is renumbered, and bad flag arrays are refused.
 */
import { describe, expect, it } from 'vitest';
import { CellType } from '../../src/model/cellTypes.ts';
import { field, pieceFromCells } from '../../src/model/meshBuild.ts';
import { withoutGhostCells } from '../../src/model/ghostCells.ts';

/** Two unit-cube polyhedra side by side along x (points 0–11) and a tetrahedron on top of the second (point 12). */
function piece(flags: number[]) {
  const pts = [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1,
    2, 0, 0, 2, 1, 0, 2, 0, 1, 2, 1, 1, 1.5, 0.5, 2];
  const cube = (a: number[]) => [[a[0]!, a[3]!, a[2]!, a[1]!], [a[4]!, a[5]!, a[6]!, a[7]!], [a[0]!, a[1]!, a[5]!, a[4]!], [a[1]!, a[2]!, a[6]!, a[5]!], [a[2]!, a[3]!, a[7]!, a[6]!], [a[3]!, a[0]!, a[4]!, a[7]!]];
  const left = [0, 1, 2, 3, 4, 5, 6, 7], right = [1, 8, 9, 2, 5, 10, 11, 6];
  return pieceFromCells(pts, {
    types: [CellType.POLYHEDRON, CellType.POLYHEDRON, CellType.TETRA],
    nodes: [left, right, [5, 10, 11, 12]],
    polyFaces: [cube(left), cube(right), undefined],
  }, {
    pointData: [field('p', 'point', 1, Float64Array.from({ length: 13 }, (_, i) => 10 * i)), { ...field('vtkGhostType', 'point', 1, new Uint8Array(13)), sourceType: 'UInt8' }],
    cellData: [field('id', 'cell', 1, Int32Array.from([100, 101, 102])), { ...field('vtkGhostType', 'cell', 1, Uint8Array.from(flags)), sourceType: 'UInt8' }],
  });
}

describe('withoutGhostCells', () => {
  it('a piece without the arrays is returned as it is', () => {
    const p = piece([0, 0, 0]);
    const bare = { ...p, cellData: p.cellData.slice(0, 1), pointData: p.pointData.slice(0, 1) };
    expect(withoutGhostCells(bare, 'x').piece).toBe(bare);
  });

  it('flags that keep a cell (2, 4, 8, 16) only drop the two arrays; the geometry arrays are the same objects', () => {
    const p = piece([16, 2, 12]);
    const r = withoutGhostCells(p, 'x');
    expect(r.leftOut).toBe(0);
    expect(r.piece.connectivity).toBe(p.connectivity);
    expect(r.piece.cellData.map((f) => f.name)).toEqual(['id']);
    expect(r.piece.pointData.map((f) => f.name)).toEqual(['p']);
  });

  it('a ghost polyhedron (1) and a hidden tetrahedron (32) go; the kept polyhedron keeps its faces and its points in order', () => {
    const r = withoutGhostCells(piece([1, 0, 32]), 'x');
    expect(r.leftOut).toBe(2);
    const q = r.piece;
    // the right cube uses points 1, 2, 5, 6, 8, 9, 10, 11 → 0..7
    expect(Array.from(q.points)).toEqual([1, 0, 0, 1, 1, 0, 1, 0, 1, 1, 1, 1, 2, 0, 0, 2, 1, 0, 2, 0, 1, 2, 1, 1]);
    expect(Array.from(q.cellTypes)).toEqual([CellType.POLYHEDRON]);
    expect(Array.from(q.connectivity)).toEqual([0, 4, 5, 1, 2, 6, 7, 3]);
    expect(Array.from(q.polyFaces!.cellFaceStart)).toEqual([0, 6]);
    expect(Array.from(q.polyFaces!.faceOffsets)).toEqual([0, 4, 8, 12, 16, 20, 24]);
    expect(Array.from(q.polyFaces!.faceConnectivity)).toEqual([0, 1, 5, 4, 2, 6, 7, 3, 0, 4, 6, 2, 4, 5, 7, 6, 5, 1, 3, 7, 1, 0, 2, 3]);
    expect(Array.from(q.pointData[0]!.values)).toEqual([10, 20, 50, 60, 80, 90, 100, 110]);
    expect(q.cellData[0]!.values).toBeInstanceOf(Int32Array);
    expect(Array.from(q.cellData[0]!.values)).toEqual([101]);
  });

  it('refuses a flag array of the wrong shape or with values that are not 8-bit flags', () => {
    const p = piece([0, 0, 0]);
    const withFlags = (f: ReturnType<typeof field>) => ({ ...p, cellData: [p.cellData[0]!, f] });
    expect(() => withoutGhostCells(withFlags(field('vtkGhostType', 'cell', 1, Float64Array.from([0, 256, 0]))), 'a.vtu: piece 2'))
      .toThrow('a.vtu: piece 2: cell array "vtkGhostType", cell 1: 256 is not a ghost flag; expected an integer 0..255 (VTK\'s ghost-cell bits)');
    expect(() => withoutGhostCells(withFlags(field('vtkGhostType', 'cell', 3, new Float64Array(9))), 'a.vtu: piece 2'))
      .toThrow('a.vtu: piece 2: cell array "vtkGhostType" has 3 component(s) and 3 tuples; expected one 8-bit ghost flag per cell (3 cells)');
    expect(() => withoutGhostCells(withFlags(field('vtkGhostType', 'cell', 1, Float64Array.from([0, NaN, 0]))), 'b')).toThrow('cell 1: NaN is not a ghost flag');
  });
});
