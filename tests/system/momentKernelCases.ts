/** The meshes and fields the browser check of the moment kernel fits (tests/system/momentKernel.test.ts). */
import { pointStencil, type Stencil } from '../../src/derive/stencils.ts';
import type { Piece } from '../../src/model/piece.ts';
import { boxMesh } from '../cut/meshes.ts';
import { smoothFields } from '../derive/smoothFields.ts';

export function kernelCases(): { p: Piece; values: Float64Array; nc: number; stencil: Stencil }[] {
  return (['polyhedron', 'hex'] as const).flatMap((kind) => {
    const p = boxMesh(kind, 6, 5, 4, 0.3), stencil = pointStencil(p), { u, s } = smoothFields(p);
    return [{ p, values: u, nc: 3, stencil }, { p, values: s, nc: 1, stencil }];
  });
}
