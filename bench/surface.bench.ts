/**
 * Surface benchmark: boundary extraction and grouping on 1M hexahedra (100³ lattice) and 998,250 tetrahedra
 * (55³ lattice, six per cube), built in memory; then force totals on ~100k faces (a 224 × 224 × 1 slab of
 * hexahedra: 101,248 boundary faces) with a pressure and a velocity point field.
 * Goals: extraction under ~1.1 s (1M hexahedra) and ~0.56 s (1M tetrahedra) — the general-purpose C++ surface
 * filter's times on this machine (VTK 9.1) — and a force total on 100k faces under 20 ms.
 */
import { benchSurface } from '../src/cli/benchStages/surface.ts';
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, withFields } from '../src/model/meshBuild.ts';
import type { Piece } from '../src/model/piece.ts';

function withFlow(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = z * (1 - z); o[1] = 0.1 * x; o[2] = 0.05 * y; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - x) + y * z; }),
  ]);
}

export async function run(): Promise<Record<string, unknown>> {
  const out: Record<string, unknown> = {};
  // Each mesh is built inline so it can be collected before the next one is timed.
  out.hexahedra = { cells: 1_000_000, goalMs: 1100, ...(await benchSurface(datasetOf([hexGrid(100, 100, 100)], '1M hexahedra'))) };
  out.tetrahedra = { cells: 6 * 55 ** 3, goalMs: 560, ...(await benchSurface(datasetOf([tetGrid(55, 55, 55)], '998,250 tetrahedra'))) };
  const slab = datasetOf([withFlow(hexGrid(224, 224, 1, (u, v, w) => [u, v, 0.01 * w]))], 'slab 224×224×1');
  out.forceOn100kFaces = { forceGoalMs: 20, ...(await benchSurface(slab, 0)) };
  return out;
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) console.log(JSON.stringify(await run(), null, 2));
