/**
 * Shape functions of the linear volume cells.
 * Reference: mathematical identities of the isoparametric elements (exact, from the definitions in
 * src/locate/shapeFunctions.ts): N_k is 1 at node k and 0 at the others; Σ N_k = 1; the derivatives are
 * those of N (checked against central differences); the trilinear functions span every trilinear
 * polynomial in (r, s, t).
 */
import { describe, expect, it } from 'vitest';
import { CellType } from '../../src/model/cellTypes.ts';
import {
  hasShapeFunctions, nodeParametric, parametricViolation, shapeDerivatives, shapeFunctions,
} from '../../src/locate/shapeFunctions.ts';
import { rng } from './meshes.ts';

const TYPES = [
  ['tetra', CellType.TETRA, 4], ['voxel', CellType.VOXEL, 8], ['hexahedron', CellType.HEXAHEDRON, 8],
  ['wedge', CellType.WEDGE, 6], ['pyramid', CellType.PYRAMID, 5],
] as const;

/** A random parametric point inside the cell of `type`. */
function inside(type: number, r: () => number): [number, number, number] {
  for (;;) {
    const p: [number, number, number] = [r(), r(), r()];
    if (parametricViolation(type, ...p) < -0.01) return p;
  }
}

describe('shape functions', () => {
  for (const [name, type, n] of TYPES) {
    it(`${name}: N_k is 1 at node k and 0 at the other nodes (Kronecker property)`, () => {
      const N = new Float64Array(8), at = new Float64Array(3);
      expect(hasShapeFunctions(type)).toBe(true);
      for (let k = 0; k < n; k++) {
        nodeParametric(type, k, at);
        expect(shapeFunctions(type, at[0]!, at[1]!, at[2]!, N)).toBe(n);
        for (let j = 0; j < n; j++) expect(N[j]).toBeCloseTo(j === k ? 1 : 0, 14);
      }
    });

    it(`${name}: partition of unity and derivatives equal central differences`, () => {
      const r = rng(11 + type), N = new Float64Array(8), Np = new Float64Array(8), Nm = new Float64Array(8), dN = new Float64Array(24);
      const h = 1e-6;
      for (let trial = 0; trial < 50; trial++) {
        const [a, b, c] = inside(type, r);
        shapeFunctions(type, a, b, c, N);
        let sum = 0;
        for (let k = 0; k < n; k++) sum += N[k]!;
        expect(sum).toBeCloseTo(1, 14);
        shapeDerivatives(type, a, b, c, dN);
        for (let d = 0; d < 3; d++) {
          shapeFunctions(type, a + (d === 0 ? h : 0), b + (d === 1 ? h : 0), c + (d === 2 ? h : 0), Np);
          shapeFunctions(type, a - (d === 0 ? h : 0), b - (d === 1 ? h : 0), c - (d === 2 ? h : 0), Nm);
          for (let k = 0; k < n; k++) expect(dN[3 * k + d]).toBeCloseTo((Np[k]! - Nm[k]!) / (2 * h), 8);
        }
      }
    });
  }

  for (const type of [CellType.HEXAHEDRON, CellType.VOXEL]) {
    it(`${type === CellType.VOXEL ? 'voxel' : 'hexahedron'}: interpolates every trilinear polynomial exactly`, () => {
      const f = (a: number, b: number, c: number) => 1 - 2 * a + 3 * b + 0.5 * c + 4 * a * b - a * c + 2.5 * b * c - 7 * a * b * c;
      const r = rng(5), N = new Float64Array(8), at = new Float64Array(3), nodal = new Float64Array(8);
      for (let k = 0; k < 8; k++) { nodeParametric(type, k, at); nodal[k] = f(at[0]!, at[1]!, at[2]!); }
      for (let trial = 0; trial < 100; trial++) {
        const [a, b, c] = [r(), r(), r()];
        shapeFunctions(type, a, b, c, N);
        let v = 0;
        for (let k = 0; k < 8; k++) v += N[k]! * nodal[k]!;
        expect(v).toBeCloseTo(f(a, b, c), 13);
      }
    });
  }

  it('parametric violation: negative inside, zero on faces, positive outside', () => {
    expect(parametricViolation(CellType.TETRA, 0.25, 0.25, 0.25)).toBeCloseTo(-0.25, 15);
    expect(parametricViolation(CellType.TETRA, 0.5, 0.5, 0)).toBe(0);
    expect(parametricViolation(CellType.HEXAHEDRON, 1.1, 0.5, 0.5)).toBeCloseTo(0.1, 15);
    expect(parametricViolation(CellType.WEDGE, 0.6, 0.6, 0.5)).toBeCloseTo(0.2, 15);
    expect(parametricViolation(CellType.PYRAMID, 0.5, 0.5, -0.01)).toBeCloseTo(0.01, 15);
  });
});
