/**
 * `pointGradientAt` on successive steps of one mesh: the quadratic least-squares fit (Barth & Frederickson
 * 1990, AIAA 90-0013, k-exact with k = 2) at chosen nodes over the mesh's cached stencil. Checks:
 *  - every request gives the direct fit's numbers for new values on the same mesh (a series' steps), and a
 *    new piece object on the same geometry arrays shares the cached stencil;
 *  - Hagen–Poiseuille wall shear τ_w = 4μV/R (Hagen 1839, Poiseuille 1840; on the n_θ-sided faceted wall
 *    τ_w·cos(π/n_θ) per face) on five successive steps of one mesh with mean speeds V, 2V, V/2, 3V and V/4.
 */
import { describe, expect, it } from 'vitest';
import { pointGradientAt, sitesOf } from '../../src/derive/fieldGradient.ts';
import { quadraticGradient } from '../../src/derive/quadraticGradient.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { field } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { PIPE_LEVELS, pipeCase, pipeExact } from '../../src/samples/pipe.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../../src/surface/surfaceCache.ts';
import { facesOfGroups } from '../../src/surface/surfaceGroups.ts';
import { wallQuantities } from '../../src/surface/wallQuantities.ts';
import { boxMesh } from '../cut/meshes.ts';

/** A quadratic vector field u = (x² + 2xy − z² + x, 3yz − y² + 2, xz − 4xy + z) and its gradient, row by row. */
function quadraticVector(x: number, y: number, z: number, u: Float64Array, g: Float64Array): void {
  u[0] = x * x + 2 * x * y - z * z + x; u[1] = 3 * y * z - y * y + 2; u[2] = x * z - 4 * x * y + z;
  g.set([2 * x + 2 * y + 1, 2 * x, -2 * z, 0, 3 * z - 2 * y, 3 * y, z - 4 * y, -4 * x, x + 1]);
}

function vectorField(p: Piece): { values: Float64Array; exact: Float64Array } {
  const n = p.points.length / 3, values = new Float64Array(3 * n), exact = new Float64Array(9 * n);
  const u = new Float64Array(3), g = new Float64Array(9);
  for (let i = 0; i < n; i++) {
    quadraticVector(p.points[3 * i]!, p.points[3 * i + 1]!, p.points[3 * i + 2]!, u, g);
    values.set(u, 3 * i); exact.set(g, 9 * i);
  }
  return { values, exact };
}

const maxDiff = (a: Float64Array, b: Float64Array): number => a.reduce((m, x, i) => Math.max(m, Math.abs(x - b[i]!)), 0);

describe('pointGradientAt across steps on one mesh', () => {

  it('gives the direct fit\'s numbers on every request, new values each time, and shares the cache with a piece on the same arrays', () => {
    const p = boxMesh('wedge', 6, 5, 4, 0.3), n = p.points.length / 3;
    const nodes = Int32Array.from({ length: 40 }, (_, k) => (11 * k) % n);
    const { values } = vectorField(p);
    const steps = [1, -2, 0.5, 3, -1.5].map((a) => values.map((v, i) => a * v + Math.sin(i)));
    // the second piece object holds the same geometry arrays (a later step of a series)
    const later: Piece = { ...p, pointData: [] };
    expect(sitesOf(later, 'point')).toBe(sitesOf(p, 'point'));
    steps.forEach((v, k) => {
      const got = pointGradientAt(k % 2 ? later : p, field('velocity', 'point', 3, v), nodes);
      const want = quadraticGradient(p.points, v, 3, sitesOf(p, 'point').stencil, nodes);
      const scale = maxDiff(want, new Float64Array(want.length));
      expect(maxDiff(got, want), `request ${k + 1}`).toBeLessThan(1e-12 * scale);
    });
    // another node list starts over with a direct fit, still the same numbers
    const other = nodes.subarray(0, 20), v = steps[0]!;
    expect(maxDiff(pointGradientAt(p, field('velocity', 'point', 3, v), other), quadraticGradient(p.points, v, 3, sitesOf(p, 'point').stencil, other))).toBeLessThan(1e-9);
  });
});

describe('Hagen–Poiseuille wall shear on successive steps of one mesh', () => {
  it('τ_w = 4μV/R·cos(π/n_θ) on every face for V, 2V, V/2, 3V and V/4 ', () => {
    const e = pipeExact(), d = pipeCase(PIPE_LEVELS.medium), facet = Math.cos(Math.PI / PIPE_LEVELS.medium.nTheta);
    const faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
    const wall = groups.groups.reduce((b, g, i, all) => (g.area > all[b]!.area ? i : b), 0);
    const sel = facesOfGroups(groups, [wall]);
    for (const scale of [1, 2, 0.5, 3, 0.25]) {
      // a new step: the same geometry arrays, new velocity values
      const step: Dataset = {
        ...d, pieces: d.pieces.map((p) => ({
          ...p, pointData: p.pointData.map((f) => (f.components === 3 ? { ...f, values: Float64Array.from(f.values, (x) => scale * x) } : f)),
        })),
      };
      const r = wallQuantities(step, faces, sel, { density: e.rho, viscosity: e.mu, speed: e.V, source: 'gradient' });
      for (const t of r.perFace.shearMagnitude) expect(t / (scale * e.wallShearStress * facet)).toBeCloseTo(1, 9);
    }
  });
});
