/** The meshes and fields the browser check of the moment kernel fits (tests/system/momentKernel.test.ts). */
import { pointStencil, type Stencil } from '../../src/derive/stencils.ts';
import type { Piece } from '../../src/model/piece.ts';
import { boxMesh } from '../cut/meshes.ts';

export function kernelCases(): { p: Piece; values: Float64Array; nc: number; stencil: Stencil }[] {
  return (['polyhedron', 'hex'] as const).flatMap((kind) => {
    const p = boxMesh(kind, 6, 5, 4, 0.3), np = p.points.length / 3, stencil = pointStencil(p);
    const u = new Float64Array(3 * np), s = new Float64Array(np);
    for (let i = 0; i < np; i++) {
      const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
      u[3 * i] = Math.sin(3 * y) * z; u[3 * i + 1] = Math.cos(2 * x) + y * y; u[3 * i + 2] = x * y * z;
      s[i] = Math.exp(x) * y + z * z * z;
    }
    return [{ p, values: u, nc: 3, stencil }, { p, values: s, nc: 1, stencil }];
  });
}
