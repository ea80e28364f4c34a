/**
 * A test mesh with one very large ring: node 0 shared by `n` tetrahedra, each with three nodes of its own at
 * random places in the unit cube about the origin, and a smooth velocity on it (3 components per node).
 */
import type { Piece } from '../../src/model/piece.ts';
import { rng } from '../cut/meshes.ts';

export function tetrahedronFan(n: number): { fan: Piece; u: Float64Array } {
  const r = rng(11), np = 1 + 3 * n;
  const points = new Float64Array(3 * np);
  for (let i = 3; i < 3 * np; i++) points[i] = r() - 0.5;
  const connectivity = new Int32Array(4 * n), offsets = new Int32Array(n + 1);
  for (let k = 0; k < n; k++) { connectivity.set([0, 1 + 3 * k, 2 + 3 * k, 3 + 3 * k], 4 * k); offsets[k + 1] = 4 * (k + 1); }
  const fan: Piece = { points, connectivity, offsets, cellTypes: new Uint8Array(n).fill(10), pointData: [], cellData: [] };
  const u = Float64Array.from({ length: 3 * np }, (_, i) => Math.sin(points[i]! * 3 + (i % 3)) + points[i - (i % 3)]! ** 2);
  return { fan, u };
}
