/**
 * `pointGradientAt` for a few nodes of a mesh whose neighbour rows are not built yet fits over those nodes'
 * rows only (localStencil.ts) and gives, bit for bit, the whole-mesh gradient's values at those nodes; the
 * reference is this repository's whole-mesh kernel (Barth & Frederickson 1990 quadratic least-squares fit,
 * checked for second-order convergence in quadraticGradient.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { fieldGradient, pointGradientAt } from '../../src/derive/fieldGradient.ts';
import { hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';

const flow = (p: Piece): Piece => withFields(p, [
  pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = Math.sin(3 * y) * z; o[1] = Math.cos(2 * x) + y * y; o[2] = x * y * z; }),
]);

describe('pointGradientAt on a few nodes of a fresh mesh', () => {
  for (const [name, make] of [['hexahedra 16×12×10', () => flow(hexGrid(16, 12, 10, (u, v, w) => [u, 1.2 * v + 0.1 * u, w]))],
    ['tetrahedra 8×8×12', () => flow(tetGrid(8, 8, 12))]] as const) {
    it(`${name}: a wall layer's nodes get the whole-mesh values bit for bit`, () => {
      const fresh = make(), reference = make();
      const np = fresh.points.length / 3;
      // the bottom layer (z = 0) and a few interior nodes, well under 1/8 of the mesh
      const nodes = Int32Array.from({ length: np }, (_, i) => i).filter((i) => fresh.points[3 * i + 2] === 0 || i % 97 === 5);
      expect(nodes.length * 8).toBeLessThan(np);
      const g = pointGradientAt(fresh, fresh.pointData[0]!, nodes), whole = fieldGradient(reference, reference.pointData[0]!);
      let differ = 0;
      nodes.forEach((n, k) => { for (let c = 0; c < 9; c++) if (!Object.is(g[9 * k + c], whole[9 * n + c])) differ++; });
      expect(differ).toBe(0);
    });
  }

  it('a node list asked again, alternating with another of the same length, gets its own values each time', () => {
    const fresh = flow(hexGrid(16, 12, 10)), reference = flow(hexGrid(16, 12, 10));
    const np = fresh.points.length / 3, u = fresh.pointData[0]!, whole = fieldGradient(reference, reference.pointData[0]!);
    // the rows built for a list are kept with the mesh for that list; two lists of one length must not share them
    const bottom = Int32Array.from({ length: np }, (_, i) => i).filter((i) => fresh.points[3 * i + 2] === 0);
    const zTop = Math.max(...Array.from({ length: np }, (_, i) => fresh.points[3 * i + 2]!));
    const top = Int32Array.from({ length: np }, (_, i) => i).filter((i) => fresh.points[3 * i + 2] === zTop);
    expect(top.length).toBe(bottom.length);
    for (const nodes of [bottom, bottom, top, bottom.slice(), top]) {
      const g = pointGradientAt(fresh, u, nodes);
      let differ = 0;
      nodes.forEach((n, k) => { for (let c = 0; c < 9; c++) if (!Object.is(g[9 * k + c], whole[9 * n + c])) differ++; });
      expect(differ).toBe(0);
    }
  });
});
