/**
 * The quadratic least-squares gradient (Barth & Frederickson 1990, AIAA 90-0013: k-exact reconstruction,
 * k = 2): exact on quadratic fields on every cell type, and second-order convergence (error ratio ≈ 4
 * when the spacing halves) on a smooth manufactured field on jittered meshes of tetrahedra, hexahedra,
 * wedges, pyramids and polyhedra, for point data (at nodes) and cell data (at centroids).
 */
import { describe, expect, it } from 'vitest';
import { fieldGradient } from '../../src/derive/fieldGradient.ts';
import { cellCentres } from '../../src/derive/stencils.ts';
import { field } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { boxMesh, type BoxKind } from '../cut/meshes.ts';

type Fn = (x: number, y: number, z: number) => [number, number, number, number];

/** f = x² + 2xy − z² + 3yz + x − 2, with its gradient. */
const quadratic: Fn = (x, y, z) => [x * x + 2 * x * y - z * z + 3 * y * z + x - 2, 2 * x + 2 * y + 1, 2 * x + 3 * z, -2 * z + 3 * y];
/** Manufactured smooth field f = sin(2x + 1)·cos(1.5y)·eᶻ, with its gradient. */
const smooth: Fn = (x, y, z) => {
  const s = Math.sin(2 * x + 1), c = Math.cos(2 * x + 1), cy = Math.cos(1.5 * y), sy = Math.sin(1.5 * y), e = Math.exp(z);
  return [s * cy * e, 2 * c * cy * e, -1.5 * s * sy * e, s * cy * e];
};

/** RMS and max gradient error over the sites of one field association. */
function gradientError(p: Piece, fn: Fn, association: 'point' | 'cell'): { rms: number; max: number } {
  const pos = association === 'point' ? p.points : cellCentres(p), n = pos.length / 3, v = new Float64Array(n);
  for (let i = 0; i < n; i++) v[i] = fn(pos[3 * i]!, pos[3 * i + 1]!, pos[3 * i + 2]!)[0];
  const g = fieldGradient(p, field('f', association, 1, v));
  let s = 0, max = 0;
  for (let i = 0; i < n; i++) {
    const ex = fn(pos[3 * i]!, pos[3 * i + 1]!, pos[3 * i + 2]!);
    for (let j = 0; j < 3; j++) { const e = Math.abs(g[3 * i + j]! - ex[j + 1]!); s += e * e; if (e > max) max = e; }
  }
  return { rms: Math.sqrt(s / (3 * n)), max };
}

const KINDS: BoxKind[] = ['tet', 'hex', 'wedge', 'pyramid', 'polyhedron', 'voxel'];

describe('exact on quadratic fields (a quadratic fit reproduces a quadratic)', () => {
  for (const kind of KINDS) {
    it(`${kind}, jittered, point and cell data`, () => {
      const p = boxMesh(kind, 5, 4, 6, kind === 'voxel' ? 0 : 0.3);
      expect(gradientError(p, quadratic, 'point').max).toBeLessThan(1e-9);
      expect(gradientError(p, quadratic, 'cell').max).toBeLessThan(1e-9);
    });
  }
});

describe('second-order convergence on a smooth manufactured field (two mesh sizes)', () => {
  for (const kind of ['tet', 'hex', 'wedge', 'pyramid', 'polyhedron'] as BoxKind[]) {
    it(`${kind}: RMS error falls ≈ 4× when the spacing halves`, () => {
      const coarse = boxMesh(kind, 6, 6, 6, 0.3), fine = boxMesh(kind, 12, 12, 12, 0.3);
      for (const association of ['point', 'cell'] as const) {
        const a = gradientError(coarse, smooth, association), b = gradientError(fine, smooth, association);
        const order = Math.log2(a.rms / b.rms);
        expect(order, `${kind} ${association} RMS order`).toBeGreaterThan(1.8);
        // boundary sites fit one-sided over two rings: their error is larger but still falls faster than first order
        expect(Math.log2(a.max / b.max), `${kind} ${association} max-error order`).toBeGreaterThan(1.4);
        expect(b.rms, `${kind} ${association} fine RMS error`).toBeLessThan(0.03);
      }
    });
  }
});

describe('degenerate neighbourhoods fall back instead of failing', () => {
  it('a single layer of wedges (a 2D case written as one layer) gives the in-plane gradient of a quadratic exactly', () => {
    const p = boxMesh('wedge', 8, 8, 1, 0);
    const fn: Fn = (x, y) => [x * x - 3 * x * y + 2 * y, 2 * x - 3 * y, -3 * x + 2, 0];
    expect(gradientError(p, fn, 'point').max).toBeLessThan(1e-9);
  });

  it('a flat mesh of one node with no neighbours gives NaN, never zeros', () => {
    const p: Piece = { points: new Float64Array([0, 0, 0]), cellTypes: new Uint8Array([1]), offsets: new Int32Array([0, 1]), connectivity: new Int32Array([0]), pointData: [], cellData: [] };
    const g = fieldGradient(p, field('f', 'point', 1, new Float64Array([1])));
    expect([...g].every(Number.isNaN)).toBe(true);
  });
});
