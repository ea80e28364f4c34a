/**
 * Iso-surfaces against exact geometry:
 *  - r = |x − c| on box meshes of every 3D cell kind: the iso r = R is a sphere, area 4πR² and volume 4/3·πR³
 *    (Archimedes, On the Sphere and Cylinder, I.33 and I.34); the surface is closed, one piece, and the errors
 *    of both fall at second order between two mesh sizes (the piecewise-linear interpolant's error is O(h²)).
 *  - a linear field f = a·x on skewed, warped meshes: every vertex lies on the plane a·x = c and the area is
 *    the box's section polygon (intersection of the plane with the box's edges, shoelace area — an algorithm
 *    independent of the extraction); a linear colour field has the exact area-weighted mean.
 *  - r = |x − c| in 2D (quads, triangles): the iso-line is a circle of length 2πR, second order.
 */
import { describe, expect, it } from 'vitest';
import { isoSurfaces } from '../../src/iso/isoSurface.ts';
import { datasetOf, field, pieceFromCells, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { Piece } from '../../src/model/piece.ts';
import { boxCorners, boxMesh, cross, dot, polygonIntegral, sectionPolygon, sub, SKEW, type BoxKind, type V3 } from '../cut/meshes.ts';

const C: V3 = [0.5, 0.48, 0.51], R = 0.3;

function radial(kind: BoxKind, n: number, jitter = 0.3): Dataset {
  const p = boxMesh(kind, n, n, n, jitter);
  return datasetOf([withFields(p, [
    pointFieldFrom(p, 'r', 1, (x, y, z, o) => { o[0] = Math.hypot(x - C[0], y - C[1], z - C[2]); }),
    pointFieldFrom(p, 'x', 1, (x, _y, _z, o) => { o[0] = x; }),
  ])], `radial-${kind}-${n}`);
}

describe('sphere r = R on box meshes (Archimedes: area 4πR², volume 4/3·πR³)', () => {
  const area = 4 * Math.PI * R * R, volume = (4 / 3) * Math.PI * R ** 3;
  for (const kind of ['tet', 'hex', 'wedge', 'pyramid', 'polyhedron', 'voxel'] as const) {
    it(`${kind}: closed, one piece, area and volume converge at second order`, () => {
      const errs = [10, 20].map((n) => {
        const [s] = isoSurfaces(radial(kind, n), { field: 'r', values: [R], colourBy: 'x' });
        expect(s!.closed).toBe(true);
        expect(s!.openReason).toBeNull();
        expect(s!.pieces).toHaveLength(1);
        expect(s!.enclosed).toBe('below');
        expect(s!.boundaryEdges).toBe(0);
        // Every vertex is a linear-interpolation point between nodes on both sides of R: within the mesh's reach of the sphere.
        const pos = s!.positions;
        for (let v = 0; v < pos.length / 3; v++) expect(Math.abs(Math.hypot(pos[3 * v]! - C[0], pos[3 * v + 1]! - C[1], pos[3 * v + 2]! - C[2]) - R)).toBeLessThan(0.02);
        // Colour x on a sphere about C: area-weighted mean C_x, range C_x ± R (to the mesh).
        expect(s!.colour!.mean).toBeCloseTo(C[0], 3);
        expect(s!.colour!.min).toBeGreaterThan(C[0] - R - 1e-9);
        return [Math.abs(s!.area / area - 1), Math.abs(s!.volume! / volume - 1)];
      });
      const [[a10, v10], [a20, v20]] = errs as [[number, number], [number, number]];
      expect(a20).toBeLessThan(0.01);
      expect(v20).toBeLessThan(0.02);
      expect(Math.log2(a10 / a20)).toBeGreaterThan(1.8);
      expect(Math.log2(v10 / v20)).toBeGreaterThan(1.8);
    });
  }

  it('a field growing inwards encloses values above the iso value, same volume', () => {
    const d = radial('hex', 12);
    const p = d.pieces[0]!, neg = withFields(p, [pointFieldFrom(p, 'depth', 1, (x, y, z, o) => { o[0] = -Math.hypot(x - C[0], y - C[1], z - C[2]); })]);
    const [up] = isoSurfaces(d, { field: 'r', values: [R] });
    const [down] = isoSurfaces(datasetOf([neg]), { field: 'depth', values: [-R] });
    expect(down!.enclosed).toBe('above');
    expect(down!.volume).toBeCloseTo(up!.volume!, 12);
    expect(down!.area).toBeCloseTo(up!.area, 12);
  });

  it('two separate balls are two closed pieces with their own area and volume; several values at once', () => {
    const p = boxMesh('tet', 16, 16, 16, 0.2);
    const c1: V3 = [0.27, 0.3, 0.5], c2: V3 = [0.72, 0.7, 0.5], r1 = 0.15, r2 = 0.2;
    const d = datasetOf([withFields(p, [pointFieldFrom(p, 'g', 1, (x, y, z, o) => {
      o[0] = Math.min(Math.hypot(x - c1[0], y - c1[1], z - c1[2]) / r1, Math.hypot(x - c2[0], y - c2[1], z - c2[2]) / r2);
    })])]);
    const [one, small] = isoSurfaces(d, { field: 'g', values: [1, 0.5] });
    expect(one!.pieces).toHaveLength(2);
    expect(one!.closed).toBe(true);
    const byX = [...one!.pieces].sort((u, v) => u.bounds[0] - v.bounds[0]);
    const [pa, pb] = byX;
    // 16 cells across: about 5 cells per radius of the small ball, so within 15 %.
    expect(Math.abs(pa!.volume! / ((4 / 3) * Math.PI * r1 ** 3) - 1)).toBeLessThan(0.15);
    expect(Math.abs(pb!.volume! / ((4 / 3) * Math.PI * r2 ** 3) - 1)).toBeLessThan(0.15);
    expect(pa!.area + pb!.area).toBeCloseTo(one!.area, 12);
    expect(one!.volume).toBeCloseTo(pa!.volume! + pb!.volume!, 12);
    expect(small!.volume!).toBeLessThan(one!.volume! / 4);
  });

  it('a dataset split into two pieces (points repeated on the interface) gives the same closed surface', () => {
    const whole = radial('hex', 12);
    const p = whole.pieces[0]!, half = p.cellTypes.length / 2;
    const part = (from: number, to: number): Piece => {
      const types: number[] = [], nodes: number[][] = [];
      for (let c = from; c < to; c++) { types.push(p.cellTypes[c]!); nodes.push(Array.from(p.connectivity.subarray(p.offsets[c]!, p.offsets[c + 1]!))); }
      return pieceFromCells(p.points, { types, nodes }, { pointData: [...p.pointData] });
    };
    const split = datasetOf([part(0, half), part(half, 2 * half)]);
    const [a] = isoSurfaces(whole, { field: 'r', values: [R] });
    const [b] = isoSurfaces(split, { field: 'r', values: [R] });
    expect(b!.closed).toBe(true);
    expect(b!.pieces).toHaveLength(1);
    expect(b!.area).toBeCloseTo(a!.area, 13);
    expect(b!.volume).toBeCloseTo(a!.volume!, 13);
  });
});

describe('iso of a linear field is the exact plane section (box section polygon, shoelace)', () => {
  const a: V3 = [0.8, -0.5, 1.3];
  const box = boxCorners(SKEW);
  for (const kind of ['tet', 'hex', 'wedge', 'pyramid', 'polyhedron'] as const) {
    it(`${kind}, skewed and warped`, () => {
      const p = boxMesh(kind, 5, 4, 6, 0.25, SKEW);
      const d = datasetOf([withFields(p, [
        pointFieldFrom(p, 'f', 1, (x, y, z, o) => { o[0] = a[0] * x + a[1] * y + a[2] * z; }),
        pointFieldFrom(p, 'u', 3, (x, y, z, o) => { o[0] = 2 * x - y; o[1] = z; o[2] = 0; }),
      ])]);
      const mid = dot(a, applyMid(box.corners));
      for (const c of [mid, mid + 0.3, mid - 0.45]) {
        const [s] = isoSurfaces(d, { field: 'f', values: [c], colourBy: 'u_x' });
        const o: V3 = [c * a[0] / dot(a, a), c * a[1] / dot(a, a), c * a[2] / dot(a, a)];
        const poly = sectionPolygon(box, o, a);
        let exact = 0;
        for (let k = 1; k + 1 < poly.length; k++) exact += 0.5 * Math.hypot(...cross(sub(poly[k]!, poly[0]!), sub(poly[k + 1]!, poly[0]!)));
        expect(s!.area).toBeCloseTo(exact, 11);
        const pos = s!.positions;
        for (let v = 0; v < pos.length / 3; v++) expect(a[0] * pos[3 * v]! + a[1] * pos[3 * v + 1]! + a[2] * pos[3 * v + 2]! - c).toBeCloseTo(0, 11);
        // Normals point along +a (towards increasing f).
        const ix = s!.indices;
        for (let t = 0; t < ix.length / 3; t++) {
          const pa = ix[3 * t]! * 3, pb = ix[3 * t + 1]! * 3, pc = ix[3 * t + 2]! * 3;
          const n = cross(sub([pos[pb]!, pos[pb + 1]!, pos[pb + 2]!], [pos[pa]!, pos[pa + 1]!, pos[pa + 2]!]), sub([pos[pc]!, pos[pc + 1]!, pos[pc + 2]!], [pos[pa]!, pos[pa + 1]!, pos[pa + 2]!]));
          expect(dot(n, a)).toBeGreaterThan(0);
        }
        expect(s!.closed).toBe(false);
        expect(s!.openReason).toMatch(/^open: \d+ boundary edges$/);
        expect(s!.boundaryEdges).toBeGreaterThan(0);
        const meanU = polygonIntegral(poly, (x, y) => 2 * x - y) / exact;
        expect(s!.colour!.mean).toBeCloseTo(meanU, 10);
        expect(s!.colour!.label).toBe('u_x');
      }
    });
  }
});

function applyMid(corners: V3[]): V3 {
  const m: V3 = [0, 0, 0];
  for (const c of corners) for (let i = 0; i < 3; i++) m[i]! += c[i]! / corners.length;
  return m;
}

describe('a value met exactly at nodes (the surface of f − v + ε)', () => {
  it('a sphere through lattice nodes is closed; a plane along a node layer has the exact area, counted once', () => {
    for (const [n, kind] of [[10, 'hex'], [10, 'tet'], [10, 'polyhedron']] as const) {
      const p = boxMesh(kind, n, n, n);
      const d = datasetOf([withFields(p, [
        pointFieldFrom(p, 'r', 1, (x, y, z, o) => { o[0] = Math.hypot(x - 0.5, y - 0.5, z - 0.5); }),
        pointFieldFrom(p, 'z', 1, (_x, _y, z, o) => { o[0] = z; }),
      ])]);
      // r = 0.3 holds at nodes such as (0.5, 0.5, 0.8) and (0.7, 0.7, 0.6) of this lattice
      const [s] = isoSurfaces(d, { field: 'r', values: [0.3] });
      expect(s!.closed, `${kind}: ${s!.openReason}`).toBe(true);
      expect(s!.pieces).toHaveLength(1);
      expect(Math.abs(s!.volume! / ((4 / 3) * Math.PI * 0.027) - 1)).toBeLessThan(0.08);
      for (const level of [0.5, 0, 1]) {
        const [pl] = isoSurfaces(d, { field: 'z', values: [level] });
        expect(pl!.area, `${kind} z = ${level}`).toBeCloseTo(level === 0 ? 0 : 1, 12);
      }
    }
  });
});

describe('fields by magnitude, component and cell data', () => {
  const p = boxMesh('hex', 6, 6, 6, 0.2);
  const d = datasetOf([withFields(p, [pointFieldFrom(p, 'velocity', 3, (_x, y, _z, o) => { o[0] = 3; o[1] = 4 * y; o[2] = 0; })],
    [field('level', 'cell', 1, Float64Array.from({ length: p.cellTypes.length }, (_, c) => c % 2))])]);

  it('a component is the plane y = c/4; the magnitude sqrt(9 + 16y²) = 4 is the plane y = √7/4', () => {
    const [s] = isoSurfaces(d, { field: 'velocity_y', values: [2] });
    expect(s!.area).toBeCloseTo(1, 12);
    for (let v = 0; v < s!.positions.length / 3; v++) expect(s!.positions[3 * v + 1]).toBeCloseTo(0.5, 12);
    const [m] = isoSurfaces(d, { field: 'velocity', values: [4] });
    expect(m!.field.label).toBe('|velocity|');
    expect(m!.area).toBeCloseTo(1, 3);
    for (let v = 0; v < m!.positions.length / 3; v++) expect(m!.positions[3 * v + 1]).toBeCloseTo(Math.sqrt(7) / 4, 2);
  });

  it('cell data is averaged to the points; colour by cell data is per triangle', () => {
    const [s] = isoSurfaces(d, { field: 'level', values: [0.5], colourBy: 'level' });
    expect(s!.field.label).toBe('level (cell data averaged to points)');
    expect(s!.indices.length).toBeGreaterThan(0);
    expect(s!.fields[0]!.association).toBe('cell');
    expect(s!.colour!.label).toBe('level (cell data)');
  });

  it('a value outside the range gives an empty surface, said so', () => {
    const [s] = isoSurfaces(d, { field: 'velocity_y', values: [99] });
    expect(s!.empty).toBe(true);
    expect(s!.volume).toBeNull();
    expect(s!.openReason).toMatch(/outside the field's range/);
  });

  it('bad specs and values give one-line errors naming them', () => {
    expect(() => isoSurfaces(d, { field: 'speed', values: [1] })).toThrow(/iso field "speed": no such field in built mesh; expected one of velocity, level/);
    expect(() => isoSurfaces(d, { field: 'velocity_7', values: [1] })).toThrow(/"velocity" has 3 components, expected a component below 3/);
    expect(() => isoSurfaces(d, { field: 'velocity', values: [Number.NaN] })).toThrow(/iso value NaN is not a finite number/);
    expect(() => isoSurfaces(d, { field: 'velocity', values: [] })).toThrow(/expected at least one iso value/);
    expect(() => isoSurfaces(d, { field: 'velocity', values: [1], colourBy: 'nope' })).toThrow(/iso field "nope"/);
  });
});

describe('iso-lines on 2D cells: a circle of length 2πR, second order', () => {
  function square(n: number, tri: boolean): Dataset {
    const pts: number[] = [], types: number[] = [], nodes: number[][] = [];
    const id = (i: number, j: number) => i + (n + 1) * j;
    for (let j = 0; j <= n; j++) for (let i = 0; i <= n; i++) pts.push(i / n, j / n, 0);
    for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) {
      const q = [id(i, j), id(i + 1, j), id(i + 1, j + 1), id(i, j + 1)];
      if (tri) { types.push(5, 5); nodes.push([q[0]!, q[1]!, q[2]!], [q[0]!, q[2]!, q[3]!]); } else { types.push(9); nodes.push(q); }
    }
    const p = pieceFromCells(pts, { types, nodes });
    return datasetOf([withFields(p, [pointFieldFrom(p, 'r', 1, (x, y, _z, o) => { o[0] = Math.hypot(x - 0.5, y - 0.5); })])]);
  }
  for (const tri of [false, true]) {
    it(tri ? 'triangles' : 'quads', () => {
      const errs = [12, 24].map((n) => {
        const [s] = isoSurfaces(square(n, tri), { field: 'r', values: [0.35] });
        expect(s!.indices.length).toBe(0);
        expect(s!.openReason).toBe('iso-lines only (2D cells)');
        return Math.abs(s!.lineLength / (2 * Math.PI * 0.35) - 1);
      });
      expect(errs[1]).toBeLessThan(0.005);
      expect(Math.log2(errs[0]! / errs[1]!)).toBeGreaterThan(1.8);
    });
  }
});
