/**
 * Detection of single-type pieces (only tetrahedra or only hexahedra, back to back), which the cut scan and
 * the cell-tree build step through with a fixed stride. Reference: the piece's own type and offset arrays.
 */
import { describe, expect, it } from 'vitest';
import { CellType } from '../../src/model/cellTypes.ts';
import { hexGrid, pieceFromCells, tetGrid, tetsWithTriangles } from '../../src/model/meshBuild.ts';
import { cellLayout, uniformSize } from '../../src/model/uniformCells.ts';

describe('uniformSize', () => {
  it('is 8 for a piece of hexahedra and 4 for a piece of tetrahedra', () => {
    const h = hexGrid(3, 2, 2), t = tetGrid(2, 2, 2);
    expect(uniformSize(h.cellTypes, h.offsets)).toBe(8);
    expect(uniformSize(t.cellTypes, t.offsets)).toBe(4);
    // cached: the same answer on a second call
    expect(uniformSize(h.cellTypes, h.offsets)).toBe(8);
  });

  it('is 0 for mixed types, other types, uneven offsets and empty pieces', () => {
    const h = hexGrid(2, 1, 1);
    const q0 = Array.from(h.connectivity.subarray(0, 8)), q1 = Array.from(h.connectivity.subarray(8, 16));
    const mixed = pieceFromCells(h.points, { types: [CellType.HEXAHEDRON, CellType.TETRA], nodes: [q0, q1.slice(0, 4)] });
    expect(uniformSize(mixed.cellTypes, mixed.offsets)).toBe(0);
    const wedges = pieceFromCells(h.points, { types: [CellType.WEDGE], nodes: [q0.slice(0, 6)] });
    expect(uniformSize(wedges.cellTypes, wedges.offsets)).toBe(0);
    // hexahedron type with a wrong node count in one cell: not uniform (the general path handles it)
    expect(uniformSize(Uint8Array.of(12, 12), Int32Array.of(0, 8, 15))).toBe(0);
    expect(uniformSize(new Uint8Array(0), Int32Array.of(0))).toBe(0);
  });

  it('checks the types array that comes with the offsets, not only the offsets', () => {
    const off = Int32Array.of(0, 4, 8);
    expect(uniformSize(Uint8Array.of(10, 10), off)).toBe(4);
    expect(uniformSize(Uint8Array.of(10, 9), off)).toBe(0);
  });
});

describe('cellLayout', () => {
  it('gives the stride, the first offset and the point ids used by a share of the cells', () => {
    const h = hexGrid(4, 1, 1), np = h.points.length / 3;
    expect(cellLayout(h)).toEqual({ size: 8, leadSize: 8, leadCells: 4, base: 0, firstPoint: 0, endPoint: np });
    // the last two cells as a share's views (offsets and types narrowed, connectivity and points whole)
    const view = { ...h, cellTypes: h.cellTypes.subarray(2, 4), offsets: h.offsets.subarray(2, 5) };
    const ids = Array.from(h.connectivity.subarray(16, 32));
    expect(cellLayout(view)).toEqual({ size: 8, leadSize: 8, leadCells: 2, base: 16, firstPoint: Math.min(...ids), endPoint: Math.max(...ids) + 1 });
  });
});

describe('cellLayout lead run', () => {
  it('is the leading cells of one type back to back, the whole piece or up to the first other cell', () => {
    const t = tetGrid(2, 2, 2), nt = t.cellTypes.length;
    const tt = tetsWithTriangles(t, 3);
    const lay = cellLayout(tt);
    expect([lay.size, lay.leadSize, lay.leadCells]).toEqual([0, 4, nt]);
    expect(tt.cellTypes[nt]).toBe(CellType.TRIANGLE);
    // a share's view that starts in the tail has no lead run
    const tail = { ...tt, cellTypes: tt.cellTypes.subarray(nt), offsets: tt.offsets.subarray(nt) };
    expect([cellLayout(tail).leadSize, cellLayout(tail).leadCells]).toEqual([0, 0]);
    // hexahedra with one node too many in the third cell: the lead stops there
    expect(cellLayout({ ...hexGrid(4, 1, 1), cellTypes: Uint8Array.of(12, 12, 12, 12), offsets: Int32Array.of(0, 8, 16, 25, 33) })).toMatchObject({ size: 0, leadSize: 8, leadCells: 2 });
  });
});
