/**
 * The one-pass fit of 1 and 3 components (moments and right-hand sides summed in one loop) against the
 * two-pass route the kernel keeps for other component counts: the same field padded with an extra component
 * takes the two-pass route, and its first components' gradients must equal the one-pass ones bit for bit, on
 * every cell type (including boundary nodes refitted over the two-ring). The method itself (Barth &
 * Frederickson 1990 quadratic least-squares fit) is checked for second order in quadraticGradient.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { quadraticGradient } from '../../src/derive/quadraticGradient.ts';
import { pointStencil } from '../../src/derive/stencils.ts';
import { smoothFields } from './smoothFields.ts';
import { boxMesh, type BoxKind } from '../cut/meshes.ts';

/** `values` (nc per node) with a zero component appended to each node. */
function padded(values: Float64Array, nc: number): Float64Array {
  const n = values.length / nc, out = new Float64Array(n * (nc + 1));
  for (let i = 0; i < n; i++) for (let c = 0; c < nc; c++) out[i * (nc + 1) + c] = values[i * nc + c]!;
  return out;
}

function differing(a: Float64Array, nc: number, b: Float64Array): number {
  const n = a.length / (3 * nc);
  let bad = 0;
  for (let i = 0; i < n; i++) for (let k = 0; k < 3 * nc; k++) if (!Object.is(a[3 * nc * i + k], b[3 * (nc + 1) * i + k])) bad++;
  return bad;
}

describe('one-pass fit equals the two-pass fit bit for bit', () => {
  for (const kind of ['tet', 'hex', 'wedge', 'pyramid', 'polyhedron'] as BoxKind[]) {
    it(`${kind}: 3-component and 1-component fields`, () => {
      const p = boxMesh(kind, 5, 4, 4, 0.3);
      const st = pointStencil(p);
      const { u, s } = smoothFields(p);
      const g3 = quadraticGradient(p.points, u, 3, st), g4 = quadraticGradient(p.points, padded(u, 3), 4, st);
      const g1 = quadraticGradient(p.points, s, 1, st), g2 = quadraticGradient(p.points, padded(s, 1), 2, st);
      expect(g3.some((v) => v !== 0 && Number.isFinite(v))).toBe(true);
      expect(differing(g3, 3, g4)).toBe(0);
      expect(differing(g1, 1, g2)).toBe(0);
    });
  }
});
