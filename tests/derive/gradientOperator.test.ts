/**
 * The gradient operator (the quadratic least-squares fit of Barth & Frederickson 1990, AIAA 90-0013, written
 * as fixed coefficients per neighbour) gives the kernel's gradients to rounding at every kind of site —
 * interior nodes (one-ring), boundary nodes, edges and corners (two-ring), on every cell type — for a smooth
 * 3-component field and a 1- and 2-component one; it is exact on a quadratic field (k-exactness, k = 2); a
 * site without neighbours gets NaN, as from the kernel.
 */
import { describe, expect, it } from 'vitest';
import { applyGradientOperator, gradientOperator } from '../../src/derive/gradientOperator.ts';
import { quadraticGradient } from '../../src/derive/quadraticGradient.ts';
import { pointStencil } from '../../src/derive/stencils.ts';
import { pieceFromCells } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { boxMesh, type BoxKind } from '../cut/meshes.ts';

/** nc values per node of f_c(x) = sin(x + c)·cos(2y)·e^(z/2) + c·x·y. */
function smoothValues(p: Piece, nc: number): Float64Array {
  const n = p.points.length / 3, v = new Float64Array(n * nc);
  for (let i = 0; i < n; i++) {
    const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
    for (let c = 0; c < nc; c++) v[i * nc + c] = Math.sin(x + c) * Math.cos(2 * y) * Math.exp(z / 2) + c * x * y;
  }
  return v;
}

/** Largest difference relative to the largest gradient component. */
function relativeGap(a: Float64Array, b: Float64Array): number {
  let scale = 0, gap = 0;
  for (let i = 0; i < a.length; i++) { scale = Math.max(scale, Math.abs(b[i]!)); gap = Math.max(gap, Math.abs(a[i]! - b[i]!)); }
  return gap / scale;
}

const KINDS: BoxKind[] = ['hex', 'tet', 'wedge', 'pyramid', 'polyhedron', 'voxel'];

describe('gradient operator equals the kernel to rounding', () => {
  for (const kind of KINDS) {
    it(`${kind}: every node, 1, 2 and 3 components`, () => {
      const p = boxMesh(kind, 5, 4, 6, kind === 'voxel' ? 0 : 0.3);
      const stencil = pointStencil(p), n = p.points.length / 3;
      const all = Int32Array.from({ length: n }, (_, i) => i);
      const op = gradientOperator(p.points, stencil, all);
      for (const nc of [1, 2, 3]) {
        const v = smoothValues(p, nc);
        const kernel = quadraticGradient(p.points, v, nc, stencil);
        expect(relativeGap(applyGradientOperator(op, v, nc), kernel), `${kind} nc=${nc}`).toBeLessThan(1e-12);
      }
    });
  }

  it('at chosen nodes only (boundary nodes in scrambled order), Float32 values', () => {
    const p = boxMesh('hex', 6, 5, 4, 0.3), stencil = pointStencil(p), n = p.points.length / 3;
    const chosen: number[] = [];
    for (let i = n - 1; i >= 0; i -= 3) if (p.points[3 * i + 2] === 0 || p.points[3 * i] === 1) chosen.push(i);
    const targets = Int32Array.from(chosen);
    const v = Float32Array.from(smoothValues(p, 3));
    const op = gradientOperator(p.points, stencil, targets);
    expect(op.targets).toEqual(targets);
    expect(relativeGap(applyGradientOperator(op, v, 3), quadraticGradient(p.points, v, 3, stencil, targets))).toBeLessThan(1e-12);
  });

  it('is exact on a quadratic field (k-exact reconstruction, k = 2)', () => {
    const p = boxMesh('tet', 4, 5, 4, 0.3), stencil = pointStencil(p), n = p.points.length / 3;
    const v = new Float64Array(n), exact = new Float64Array(3 * n);
    for (let i = 0; i < n; i++) {
      const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
      v[i] = x * x + 2 * x * y - z * z + 3 * y * z + x - 2;
      exact[3 * i] = 2 * x + 2 * y + 1; exact[3 * i + 1] = 2 * x + 3 * z; exact[3 * i + 2] = -2 * z + 3 * y;
    }
    const g = applyGradientOperator(gradientOperator(p.points, stencil, Int32Array.from({ length: n }, (_, i) => i)), v, 1);
    expect(relativeGap(g, exact)).toBeLessThan(1e-10);
  });

  it('gives NaN at a node no cell reaches, like the kernel', () => {
    // one tetrahedron and a lone point (id 4) that no cell uses
    const p = pieceFromCells([0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1, 5, 5, 5], { types: [10], nodes: [[0, 1, 2, 3]] });
    const stencil = pointStencil(p), targets = Int32Array.of(0, 4);
    const v = Float64Array.of(0, 1, 2, 3, 9);
    const op = gradientOperator(p.points, stencil, targets);
    const g = applyGradientOperator(op, v, 1), k = quadraticGradient(p.points, v, 1, stencil, targets);
    expect(Array.from(op.empty)).toEqual([0, 1]);
    expect(Array.from(g.subarray(3))).toEqual([NaN, NaN, NaN]);
    expect(Array.from(k.subarray(3))).toEqual([NaN, NaN, NaN]);
    // a single tetrahedron: the linear part is fitted exactly (curvature terms dropped)
    expect(Array.from(g.subarray(0, 3)).map((x) => +x.toFixed(12))).toEqual([1, 2, 3]);
    expect(relativeGap(g.subarray(0, 3), k.subarray(0, 3))).toBeLessThan(1e-12);
  });
});
