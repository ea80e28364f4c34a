import { describe, expect, it } from 'vitest';
import { datasetBounds } from '../../src/model/bounds.ts';
import { cellStarts, pieceOfCell } from '../../src/model/dataset.ts';
import { loadReport } from '../../src/model/loadReport.ts';
import { datasetOf, field, hexGrid, pieceFromCells, tetGrid, tetsWithTriangles } from '../../src/model/meshBuild.ts';

/** Signed volume of a tetra given 4 point ids (exact arithmetic reference: 1/6 of the triple product). */
function tetVolume(p: Float64Array, a: number, b: number, c: number, d: number): number {
  const ax = p[3 * b]! - p[3 * a]!, ay = p[3 * b + 1]! - p[3 * a + 1]!, az = p[3 * b + 2]! - p[3 * a + 2]!;
  const bx = p[3 * c]! - p[3 * a]!, by = p[3 * c + 1]! - p[3 * a + 1]!, bz = p[3 * c + 2]! - p[3 * a + 2]!;
  const cx = p[3 * d]! - p[3 * a]!, cy = p[3 * d + 1]! - p[3 * a + 1]!, cz = p[3 * d + 2]! - p[3 * a + 2]!;
  return (ax * (by * cz - bz * cy) - ay * (bx * cz - bz * cx) + az * (bx * cy - by * cx)) / 6;
}

describe('mesh builders', () => {
  it('tetGrid fills the unit cube with positive tetrahedra (total volume 1)', () => {
    const p = tetGrid(3, 2, 4);
    let v = 0;
    for (let c = 0; c < p.cellTypes.length; c++) {
      const o = p.offsets[c]!, q = p.connectivity;
      const vol = tetVolume(p.points, q[o]!, q[o + 1]!, q[o + 2]!, q[o + 3]!);
      expect(vol).toBeGreaterThan(0);
      v += vol;
    }
    expect(v).toBeCloseTo(1, 14);
  });

  it('load report counts cells, ranges and bounds across pieces', () => {
    const a = hexGrid(2, 2, 2), b = hexGrid(1, 1, 1, (u, v, w) => [u + 1, v, w]);
    const withP = { ...a, pointData: [field('p', 'point', 1, new Float64Array(27).map((_, i) => i))] };
    const d = datasetOf([withP, b]);
    const r = loadReport(d);
    expect(r.cells).toBe(9);
    expect(r.points).toBe(35);
    expect(r.cellTypes).toEqual({ 12: 9 });
    expect(r.pointData).toEqual([{ name: 'p', association: 'point', components: 1, type: 'Float64', range: [0, 26], pieces: 1 }]);
    expect(datasetBounds(d)).toEqual([0, 2, 0, 1, 0, 1]);
    const s = cellStarts(d);
    expect(Array.from(s)).toEqual([0, 8, 9]);
    expect(pieceOfCell(s, 7)).toBe(0);
    expect(pieceOfCell(s, 8)).toBe(1);
  });

  it('tetrahedra followed by triangles on the first three nodes of every n-th of them', () => {
    const t = tetGrid(2, 2, 2), p = tetsWithTriangles(t, 5);
    // 48 tetrahedra, then triangles on tetrahedra 0, 5, …, 45: 10
    expect(p.cellTypes.length).toBe(58);
    expect(Array.from(p.cellTypes.subarray(0, 48)).every((c) => c === 10)).toBe(true);
    expect(Array.from(p.cellTypes.subarray(48)).every((c) => c === 5)).toBe(true);
    expect(Array.from(p.connectivity.subarray(0, 192))).toEqual(Array.from(t.connectivity));
    expect(Array.from(p.connectivity.subarray(192 + 3, 192 + 6))).toEqual(Array.from(t.connectivity.subarray(20, 23)));
    expect(Array.from(p.points)).toEqual(Array.from(t.points));
  });

  it('rejects connectivity out of range with a clear message', () => {
    expect(() => pieceFromCells([0, 0, 0, 1, 0, 0, 0, 1, 0], { types: [5], nodes: [[0, 1, 3]] }))
      .toThrow(/connectivity entry 2 is point 3, but the piece has 3 points/);
  });
});
