/**
 * Line probes: evenly spaced samples and samples at every cell-face crossing.
 * References: mathematical identities — a linear field is interpolated exactly on every cell type; on an
 * axis-aligned lattice the face crossings of a straight segment are the lattice planes it passes
 * (x = i/n etc.), computable by hand; a crossing lies on a face of the cell that holds it (parametric
 * distance to the nearest face 0) and the stretch between two crossings lies within one cell.
 */
import { describe, expect, it } from 'vitest';
import { CellType } from '../../src/model/cellTypes.ts';
import { datasetOf, hexGrid, pieceFromCells, pointFieldFrom, withFields, field } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { getCellTree } from '../../src/locate/cellTree.ts';
import { probeLine } from '../../src/locate/lineProbe.ts';
import { lineStats } from '../../src/locate/lineStats.ts';
import { createLocation, locatePoint } from '../../src/locate/locatePoint.ts';
import { segmentCrossings } from '../../src/locate/segmentCrossings.ts';
import { jitteredHex, meshesOfEveryType, rng } from './meshes.ts';

const lin = (x: number, y: number, z: number) => 0.5 - x + 2 * y + 3 * z;
const withLinear = (p: Piece): Piece => withFields(p, [
  pointFieldFrom(p, 'f', 1, (x, y, z, o) => { o[0] = lin(x, y, z); }),
  pointFieldFrom(p, 'v', 3, (x, y, z, o) => { o[0] = x; o[1] = 2 * y - z; o[2] = -3; }),
]);

describe('line probe', () => {
  for (const { name, dataset } of meshesOfEveryType(3)) {
    it(`${name}: a linear field is exact at every sample, evenly spaced and at crossings`, () => {
      const d = datasetOf([withLinear(dataset.pieces[0]!)]);
      const r = rng(4);
      for (let trial = 0; trial < 10; trial++) {
        // The voxel mesh fills [0, 1.5] × [0, 1] × [0.3, 1].
        const pick = () => (name === 'voxel' ? [1.5 * r(), r(), 0.3 + 0.7 * r()] as const : [r(), r(), r()] as const);
        const a = pick(), b = pick();
        for (const mode of ['samples', 'crossings'] as const) {
          const res = probeLine(d, a, b, { mode, samples: 37 });
          expect(res.outside).toBe(false);
          for (let i = 0; i < res.count; i++) {
            expect(res.valid[i]).toBe(1);
            expect(Math.abs(res.fields[0]!.columns[0]![i]! - lin(res.x[i]!, res.y[i]!, res.z[i]!))).toBeLessThan(1e-12);
            expect(res.fields[1]!.labels).toEqual(['v_x', 'v_y', 'v_z']);
            expect(res.fields[1]!.columns[1]![i]).toBeCloseTo(2 * res.y[i]! - res.z[i]!, 12);
          }
        }
      }
    });
  }

  it('crossings on an axis-aligned lattice are the lattice planes the segment passes', () => {
    const d = datasetOf([withLinear(hexGrid(4, 5, 2))]);
    const a = [0.1, 0.05, 0.3] as const, b = [0.93, 0.88, 0.8] as const;
    const res = probeLine(d, a, b, { mode: 'crossings' });
    const expected = [0, 1];
    for (const [axis, n] of [[0, 4], [1, 5], [2, 2]] as const) {
      for (let i = 1; i < n; i++) {
        const t = (i / n - a[axis]) / (b[axis] - a[axis]);
        if (t > 0 && t < 1) expected.push(t);
      }
    }
    expected.sort((p, q) => p - q);
    // x = 0.25 and y = 0.2 are met at the same point (the segment passes a lattice edge there): one crossing.
    for (let i = expected.length - 1; i > 0; i--) if (expected[i]! - expected[i - 1]! < 1e-12) expected.splice(i, 1);
    expect(expected.length).toBe(9);
    expect(res.count).toBe(expected.length);
    expected.forEach((t, i) => expect(res.s[i]! / res.length).toBeCloseTo(t, 13));
    expect(Array.from(res.intervalInside)).toEqual(new Array(res.count - 1).fill(1));
  });

  it('crossings on distorted hexahedra lie on curved (bilinear) faces, and each stretch between crossings is inside one cell', () => {
    const d = datasetOf([withLinear(jitteredHex(5, 0.25, 8))]);
    const tree = getCellTree(d), loc = createLocation(), r = rng(12);
    for (let trial = 0; trial < 10; trial++) {
      const a = [r(), r(), r()], b = [r(), r(), r()];
      const taus = Array.from(segmentCrossings(tree, a[0]!, a[1]!, a[2]!, b[0]!, b[1]!, b[2]!));
      const at = (t: number) => [a[0]! + t * (b[0]! - a[0]!), a[1]! + t * (b[1]! - a[1]!), a[2]! + t * (b[2]! - a[2]!)] as const;
      for (let i = 1; i + 1 < taus.length; i++) {
        expect(locatePoint(tree, ...at(taus[i]!), loc)).toBe(true);
        // On a face: the parametric distance to the nearest face is 0 (up to rounding).
        expect(Math.abs(loc.violation)).toBeLessThan(1e-9);
      }
      // Dense sampling finds no cell change that is not bracketed by a crossing.
      for (let i = 0; i + 1 < taus.length; i++) {
        const cells = new Set<number>();
        for (let k = 1; k < 20; k++) {
          expect(locatePoint(tree, ...at(taus[i]! + (k / 20) * (taus[i + 1]! - taus[i]!)), loc)).toBe(true);
          if (loc.violation < -1e-6) cells.add(loc.cell);
        }
        expect(cells.size).toBeLessThanOrEqual(1);
      }
    }
  });

  it('samples outside the mesh are flagged, hold NaN (never 0) and are left out of the statistics', () => {
    const d = datasetOf([withLinear(hexGrid(4, 4, 4))]);
    const res = probeLine(d, [-1, 0.5, 0.5], [2, 0.5, 0.5], { samples: 31 });
    expect(res.outside).toBe(false);
    for (let i = 0; i < res.count; i++) {
      const inside = res.x[i]! >= -1e-12 && res.x[i]! <= 1 + 1e-12;
      expect(res.valid[i]).toBe(inside ? 1 : 0);
      if (!inside) { expect(res.fields[0]!.columns[0]![i]).toBeNaN(); expect(res.cell[i]).toBe(-1); }
    }
    const st = lineStats(res);
    expect(st.coveredLength).toBeCloseTo(1, 12);
    expect(st.gaps).toEqual([{ from: 0, to: expect.closeTo(1, 12) }, { from: expect.closeTo(2, 12), to: 3 }]);
    const f = st.series.find((q) => q.label === 'f')!.stats;
    // ∫_0^1 (0.5 − x + 1 + 1.5) dx = 2.5; the trapezoid rule is exact for a linear field.
    expect(f.integral).toBeCloseTo(2.5, 12);
    expect(f.mean).toBeCloseTo(2.5, 12);
    expect(f.min).toBeCloseTo(2, 12);
    expect(f.max).toBeCloseTo(3, 12);
  });

  it('crossings find a hole in the domain: the stretch across it is outside even though both ends are inside', () => {
    // Two blocks with a gap 0.4 < x < 0.6 between them.
    const left = withLinear(hexGrid(2, 2, 2, (u, v, w) => [0.4 * u, v, w]));
    const right = withLinear(hexGrid(2, 2, 2, (u, v, w) => [0.6 + 0.4 * u, v, w]));
    const d = datasetOf([left, right]);
    const res = probeLine(d, [0.1, 0.3, 0.3], [0.9, 0.3, 0.3], { mode: 'crossings' });
    const xs = Array.from(res.x);
    expect(xs.map((x) => Number(x.toFixed(12)))).toEqual([0.1, 0.2, 0.4, 0.6, 0.8, 0.9]);
    expect(Array.from(res.valid)).toEqual([1, 1, 1, 1, 1, 1]);
    expect(Array.from(res.intervalInside)).toEqual([1, 1, 0, 1, 1]);
    const st = lineStats(res);
    expect(st.coveredLength).toBeCloseTo(0.6, 12);
    expect(st.gaps).toEqual([{ from: expect.closeTo(0.3, 12), to: expect.closeTo(0.5, 12) }]);
    // ∫ over x in [0.1, 0.4] ∪ [0.6, 0.9] of (0.5 − x + 0.6 + 0.9) dx.
    const F = (x: number) => 2 * x - x * x / 2;
    expect(st.series.find((q) => q.label === 'f')!.stats.integral).toBeCloseTo(F(0.4) - F(0.1) + F(0.9) - F(0.6), 12);
  });

  it('a line wholly outside the mesh gives an empty, flagged result with no statistics', () => {
    const d = datasetOf([withLinear(hexGrid(2, 2, 2))]);
    for (const mode of ['samples', 'crossings'] as const) {
      const res = probeLine(d, [2, 2, 2], [3, 2.5, 2], { mode });
      expect(res.outside).toBe(true);
      expect(res.count).toBe(0);
      expect(res.s.length).toBe(0);
      expect(res.fields[0]!.columns[0]!.length).toBe(0);
      const st = lineStats(res);
      expect(st.coveredLength).toBe(0);
      expect(st.gaps).toEqual([{ from: 0, to: res.length }]);
      expect(st.series[0]!.stats.integral).toBeNaN();
      expect(st.series[0]!.stats.mean).toBeNaN();
    }
  });

  it('cell data is constant per cell; point:/cell: pick the association when names clash', () => {
    const p = hexGrid(2, 1, 1);
    const d = datasetOf([withFields(p, [pointFieldFrom(p, 'q', 1, (x, _y, _z, o) => { o[0] = x; })], [field('q', 'cell', 1, Float64Array.of(10, 20))])]);
    const pointRes = probeLine(d, [0.1, 0.5, 0.5], [0.9, 0.5, 0.5], { samples: 5, fields: ['q'] });
    expect(pointRes.fields[0]!.association).toBe('point');
    expect(Array.from(pointRes.fields[0]!.columns[0]!)).toEqual([0.1, 0.30000000000000004, 0.5, 0.7000000000000001, 0.9].map((v) => expect.closeTo(v, 14)));
    const cellRes = probeLine(d, [0.1, 0.5, 0.5], [0.9, 0.5, 0.5], { samples: 5, fields: ['cell:q'] });
    expect(Array.from(cellRes.fields[0]!.columns[0]!)).toEqual([10, 10, 10, 20, 20]);
  });

  it('rejects bad input with a one-line message', () => {
    const d = datasetOf([withLinear(hexGrid(2, 2, 2))]);
    expect(() => probeLine(d, [0, 0, 0], [0, 0, 0])).toThrow(/end points coincide/);
    expect(() => probeLine(d, [0, 0, 0], [1, 1, 1], { samples: 1 })).toThrow(/samples must be an integer from 2/);
    expect(() => probeLine(d, [0, 0, 0], [1, 1, 1], { fields: ['nope'] })).toThrow(/no field "nope".*point fields: f, v/);
    expect(() => probeLine(d, [0, 0, NaN], [1, 1, 1])).toThrow(/finite/);
    const surf = datasetOf([pieceFromCells([0, 0, 0, 1, 0, 0, 0, 1, 0], { types: [CellType.TRIANGLE], nodes: [[0, 1, 2]] })], 'skin.vtp', 'polydata');
    expect(() => probeLine(surf, [0, 0, 0], [1, 1, 0])).toThrow(/no volume cells/);
  });
});
