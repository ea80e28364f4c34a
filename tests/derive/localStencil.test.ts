/**
 * `pointStencilAround` gives, for chosen nodes and their neighbours, exactly the rows `pointStencil` gives
 * (same nodes, same order), and empty rows elsewhere — on every cell type, with the chosen nodes on the
 * boundary and inside.
 */
import { describe, expect, it } from 'vitest';
import { pointStencilAround } from '../../src/derive/localStencil.ts';
import { pointStencil } from '../../src/derive/stencils.ts';
import { boxMesh, type BoxKind } from '../cut/meshes.ts';

const row = (s: { offsets: Int32Array; ids: Int32Array }, i: number) => Array.from(s.ids.subarray(s.offsets[i]!, s.offsets[i + 1]!));

describe('point stencil around chosen nodes', () => {
  for (const kind of ['hex', 'tet', 'wedge', 'pyramid', 'polyhedron', 'voxel'] as BoxKind[]) {
    it(`${kind}: rows of the chosen nodes and their neighbours equal the whole stencil's`, () => {
      const p = boxMesh(kind, 5, 4, 3, kind === 'voxel' ? 0 : 0.3), n = p.points.length / 3;
      const chosen = Int32Array.from([0, 7, n - 1, Math.floor(n / 2)]);
      const full = pointStencil(p), local = pointStencilAround(p, chosen);
      const needed = new Set<number>(chosen);
      for (const i of chosen) for (const q of row(full, i)) needed.add(q);
      expect(needed.size).toBeGreaterThan(chosen.length);
      for (let i = 0; i < n; i++) expect(row(local, i), `row ${i}`).toEqual(needed.has(i) ? row(full, i) : []);
    });
  }
});
