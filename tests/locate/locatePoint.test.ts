/**
 * Point location and interpolation.
 * References: mathematical identities — the isoparametric interpolation reproduces every linear field
 * exactly (Σ N_k = 1 and Σ N_k x_k = x at the located point), the polyhedron's tetra split with centre
 * values taken as the mean of the points reproduces linear fields too, and trilinear shape functions
 * reproduce trilinear fields on axis-aligned hexahedra (where x, y, z are affine in r, s, t). A point
 * generated inside a known cell (random parametric coordinates mapped through the cell's shape
 * functions) must be found in that cell, at those parametric coordinates.
 */
import { describe, expect, it } from 'vitest';
import { CellType } from '../../src/model/cellTypes.ts';
import { cellStarts, type Dataset } from '../../src/model/dataset.ts';
import { datasetOf, hexGrid, pieceFromCells, tetGrid } from '../../src/model/meshBuild.ts';
import { getCellTree } from '../../src/locate/cellTree.ts';
import { createLocation, locatePoint, type Location } from '../../src/locate/locatePoint.ts';
import { parametricViolation, shapeFunctions } from '../../src/locate/shapeFunctions.ts';
import { meshesOfEveryType, rng } from './meshes.ts';

const linear = (x: number, y: number, z: number) => 1.5 + 2 * x - 3 * y + 0.7 * z;

/** Interpolates f (a function of position, sampled at the piece's points) with the location's weights. */
function interpolate(d: Dataset, loc: Location, f: (x: number, y: number, z: number) => number): number {
  const pts = d.pieces[loc.piece]!.points;
  let v = 0;
  for (let k = 0; k < loc.count; k++) {
    const i = 3 * loc.ids[k]!;
    v += loc.weights[k]! * f(pts[i]!, pts[i + 1]!, pts[i + 2]!);
  }
  return v;
}

/** A point inside cell c: random parametric coordinates mapped through the shape functions (polyhedra: pulled toward the centre). */
function pointIn(d: Dataset, c: number, r: () => number, out: Float64Array): [number, number, number] {
  const p = d.pieces[0]!, type = p.cellTypes[c]!, a = p.offsets[c]!, n = p.offsets[c + 1]! - a;
  const N = new Float64Array(8);
  let pr: [number, number, number] = [NaN, NaN, NaN];
  if (type === CellType.POLYHEDRON) {
    const w = Array.from({ length: n }, () => r());
    const sw = w.reduce((s, q) => s + q, 0);
    for (let k = 0; k < n; k++) N[k] = 0.6 / n + 0.4 * w[k]! / sw;
  } else {
    do pr = [r(), r(), r()]; while (parametricViolation(type, ...pr) > -0.02);
    shapeFunctions(type, ...pr, N);
  }
  out.fill(0);
  for (let k = 0; k < n; k++) for (let q = 0; q < 3; q++) out[q] += N[k]! * p.points[3 * p.connectivity[a + k]! + q]!;
  return pr;
}

describe('locatePoint', () => {
  for (const { name, type, dataset } of meshesOfEveryType(3)) {
    it(`${name}: random points in random cells of a distorted mesh are found in their cell, and linear fields interpolate exactly`, () => {
      const tree = getCellTree(dataset), loc = createLocation(), r = rng(100 + type), x = new Float64Array(3);
      const nCells = dataset.pieces[0]!.cellTypes.length;
      for (let trial = 0; trial < 300; trial++) {
        const c = Math.floor(r() * nCells);
        const pr = pointIn(dataset, c, r, x);
        expect(locatePoint(tree, x[0]!, x[1]!, x[2]!, loc)).toBe(true);
        expect(loc.cell).toBe(c);
        expect(loc.type).toBe(type);
        if (type !== CellType.POLYHEDRON) {
          expect(loc.r).toBeCloseTo(pr[0], 9); expect(loc.s).toBeCloseTo(pr[1], 9); expect(loc.t).toBeCloseTo(pr[2], 9);
        } else expect(loc.r).toBeNaN();
        expect(Math.abs(interpolate(dataset, loc, linear) - linear(x[0]!, x[1]!, x[2]!))).toBeLessThan(1e-12);
      }
    });

    it(`${name}: points anywhere in the unit cube are located (the mesh fills it) and linear fields are exact`, () => {
      const tree = getCellTree(dataset), loc = createLocation(), r = rng(7 + type);
      for (let trial = 0; trial < 300; trial++) {
        const [x, y, z] = name === 'voxel' ? [1.5 * r(), r(), 0.3 + 0.7 * r()] : [r(), r(), r()];
        expect(locatePoint(tree, x, y, z, loc)).toBe(true);
        expect(Math.abs(interpolate(dataset, loc, linear) - linear(x, y, z))).toBeLessThan(1e-12);
      }
    });
  }

  it('hexahedra with uneven axis-aligned spacing reproduce a trilinear field exactly', () => {
    const d = datasetOf([hexGrid(4, 3, 5, (u, v, w) => [u * u + u, 2 * v ** 1.5, 0.5 * w + 0.3 * w * w])]);
    const f = (x: number, y: number, z: number) => 2 - x + 0.3 * y + 4 * z + 1.5 * x * y - 2 * y * z + 0.7 * x * z + 3 * x * y * z;
    const tree = getCellTree(d), loc = createLocation(), r = rng(3);
    for (let trial = 0; trial < 300; trial++) {
      const x = 2 * r(), y = 2 * r(), z = 0.8 * r();
      expect(locatePoint(tree, x, y, z, loc)).toBe(true);
      expect(interpolate(d, loc, f)).toBeCloseTo(f(x, y, z), 12);
    }
  });

  it('a point on a face shared by two cells goes to the lower global cell id, whatever the hint', () => {
    const d = datasetOf([hexGrid(2, 2, 2)]);
    const tree = getCellTree(d), loc = createLocation();
    // x = 0.5 is the face between cells 0 and 1 (and 2/3, 4/5, 6/7 higher up).
    expect(locatePoint(tree, 0.5, 0.25, 0.25, loc)).toBe(true);
    expect(loc.cell).toBe(0);
    expect(locatePoint(tree, 0.5, 0.25, 0.25, loc, undefined, 1)).toBe(true);
    expect(loc.cell).toBe(0);
    // The corner shared by all eight cells.
    expect(locatePoint(tree, 0.5, 0.5, 0.5, loc, undefined, 7)).toBe(true);
    expect(loc.cell).toBe(0);
    const t = datasetOf([tetGrid(2, 2, 2)]);
    const tt = getCellTree(t);
    expect(locatePoint(tt, 0.5, 0.5, 0.5, loc)).toBe(true);
    expect(loc.cell).toBe(0);
  });

  it('boundary points resolve within the tolerance; points beyond it are outside', () => {
    const d = datasetOf([hexGrid(2, 2, 2)]);
    const tree = getCellTree(d), loc = createLocation();
    expect(locatePoint(tree, 0, 0.3, 0.7, loc)).toBe(true);
    expect(locatePoint(tree, 1, 1, 1, loc)).toBe(true);
    expect(loc.cell).toBe(7);
    // 1e-9 outside a cell of size 0.5 is 2e-9 parametric: inside the default 1e-6.
    expect(locatePoint(tree, -1e-9, 0.3, 0.7, loc)).toBe(true);
    expect(locatePoint(tree, -1e-5, 0.3, 0.7, loc)).toBe(false);
    expect(loc.cell).toBe(-1);
    expect(locatePoint(tree, -1e-5, 0.3, 0.7, loc, 1e-4)).toBe(true);
    expect(locatePoint(tree, 1.5, 0.3, 0.7, loc)).toBe(false);
  });

  it('a surface-only dataset cannot locate: the error says so', () => {
    const p = pieceFromCells([0, 0, 0, 1, 0, 0, 0, 1, 0], { types: [CellType.TRIANGLE], nodes: [[0, 1, 2]] });
    const d = datasetOf([p], 'wall.vtp', 'polydata');
    expect(() => locatePoint(getCellTree(d), 0.2, 0.2, 0, createLocation())).toThrow(/wall\.vtp.*no volume cells.*only inside 3D cells/);
  });

  it('2D cells in a volume mesh are skipped: a point on a boundary triangle is located in the tetra behind it', () => {
    const t = tetGrid(1, 1, 1);
    const tri = pieceFromCells(t.points, { types: [CellType.TRIANGLE, ...t.cellTypes], nodes: [[0, 1, 3], ...Array.from({ length: 6 }, (_, c) => Array.from(t.connectivity.subarray(4 * c, 4 * c + 4)))] });
    const d = datasetOf([tri]);
    const loc = createLocation();
    expect(locatePoint(getCellTree(d), 0.6, 0.2, 0, loc)).toBe(true);
    expect(loc.type).toBe(CellType.TETRA);
    expect(loc.cell).toBeGreaterThan(0);
  });

  it('pyramid apex and points just below it (where Newton is singular) are located with exact linear interpolation', () => {
    const p = pieceFromCells([0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0.4, 0.6, 1], { types: [CellType.PYRAMID], nodes: [[0, 1, 2, 3, 4]] });
    const d = datasetOf([p]);
    const tree = getCellTree(d), loc = createLocation();
    for (const [x, y, z] of [[0.4, 0.6, 1], [0.4, 0.6, 0.999999], [0.41, 0.6, 0.98], [0.4, 0.6, 1 - 1e-12], [0.5, 0.5, 0.5]] as const) {
      expect(locatePoint(tree, x, y, z, loc)).toBe(true);
      expect(Math.abs(interpolate(d, loc, linear) - linear(x, y, z))).toBeLessThan(1e-9);
    }
    expect(locatePoint(tree, 0.4, 0.6, 1.001, loc)).toBe(false);
  });

  it('strongly distorted hexahedra (a corner pushed deep in; the top face twisted by 50°) are located correctly, with exact linear fields', () => {
    const pushed = [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 0.7, 0.7, 0.7, 0, 1, 1];
    const twisted: number[] = [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0];
    const a = (50 * Math.PI) / 180;
    for (const [x, y] of [[0, 0], [1, 0], [1, 1], [0, 1]] as const) {
      twisted.push(0.5 + Math.cos(a) * (x - 0.5) - Math.sin(a) * (y - 0.5), 0.5 + Math.sin(a) * (x - 0.5) + Math.cos(a) * (y - 0.5), 1.2);
    }
    for (const pts of [pushed, twisted]) {
      const d = datasetOf([pieceFromCells(pts, { types: [CellType.HEXAHEDRON], nodes: [[0, 1, 2, 3, 4, 5, 6, 7]] })]);
      const tree = getCellTree(d), loc = createLocation(), r = rng(9), x = new Float64Array(3);
      for (let trial = 0; trial < 200; trial++) {
        const pr = pointIn(d, 0, r, x);
        expect(locatePoint(tree, x[0]!, x[1]!, x[2]!, loc)).toBe(true);
        expect(loc.r).toBeCloseTo(pr[0], 8); expect(loc.s).toBeCloseTo(pr[1], 8); expect(loc.t).toBeCloseTo(pr[2], 8);
        expect(Math.abs(interpolate(d, loc, linear) - linear(x[0]!, x[1]!, x[2]!))).toBeLessThan(1e-11);
      }
    }
  });

  it('pentagonal and hexagonal prisms (split like polyhedra) locate and interpolate linear fields exactly', () => {
    for (const [type, m] of [[CellType.PENTAGONAL_PRISM, 5], [CellType.HEXAGONAL_PRISM, 6]] as const) {
      const pts: number[] = [];
      for (const z of [0, 1.3]) for (let k = 0; k < m; k++) pts.push(Math.cos((2 * Math.PI * k) / m) + 0.1 * z, Math.sin((2 * Math.PI * k) / m), z);
      const d = datasetOf([pieceFromCells(pts, { types: [type], nodes: [Array.from({ length: 2 * m }, (_, i) => i)] })]);
      const tree = getCellTree(d), loc = createLocation(), r = rng(type);
      for (let trial = 0; trial < 100; trial++) {
        const rad = 0.75 * Math.sqrt(r()), th = 2 * Math.PI * r(), z = 1.3 * r();
        const x = rad * Math.cos(th) + 0.1 * z, y = rad * Math.sin(th);
        expect(locatePoint(tree, x, y, z, loc)).toBe(true);
        expect(loc.type).toBe(type);
        expect(Math.abs(interpolate(d, loc, linear) - linear(x, y, z))).toBeLessThan(1e-12);
      }
      expect(locatePoint(tree, 1.2, 0, 0.5, loc)).toBe(false);
    }
  });

  it('global cell ids and pieces across a multi-piece dataset', () => {
    const a = hexGrid(2, 2, 2), b = tetGrid(1, 1, 1, (u, v, w) => [u + 1, v, w]);
    const d = datasetOf([a, b]);
    const tree = getCellTree(d), loc = createLocation();
    expect(locatePoint(tree, 1.5, 0.2, 0.7, loc)).toBe(true);
    expect(loc.piece).toBe(1);
    expect(loc.cell).toBe(cellStarts(d)[1]! + loc.localCell);
    expect(Math.abs(interpolate(d, loc, linear) - linear(1.5, 0.2, 0.7))).toBeLessThan(1e-12);
    expect(locatePoint(tree, 0.3, 0.8, 0.1, loc)).toBe(true);
    expect(loc.piece).toBe(0);
  });

  it('rejects a tolerance above the tree padding', async () => {
    const { checkTolerance } = await import('../../src/locate/locatePoint.ts');
    expect(() => checkTolerance(1e-3, 'line probe')).toThrow(/line probe: tolerance 0\.001 is outside 0\.\.0\.0001/);
  });
});
