/**
 * Cut-plane benchmark: cut plus integrals on 1M hexahedra and on about 1M tetrahedra built in memory,
 * twelve planes each (see `src/cli/benchStages/cut.ts`); the first cut (linear scan, no tree) and the later
 * ones (tree query) reported apart. Fields: a velocity vector and a pressure scalar at the points.
 */
import { benchCuts } from '../src/cli/benchStages/cut.ts';
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, withFields } from '../src/model/meshBuild.ts';
import type { Piece } from '../src/model/piece.ts';

function withFlow(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 0.1 * y; o[1] = -0.1 * x; o[2] = 4 * x * (1 - x) * y * (1 - y) + 0.01 * z; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - z) + x * y; }),
  ]);
}

export async function run(): Promise<Record<string, unknown>> {
  const out: Record<string, unknown> = {};
  let t = performance.now();
  const hex = datasetOf([withFlow(hexGrid(100, 100, 100))], '1M hexahedra (100³ unit-cube lattice)');
  const hexBuildMs = performance.now() - t;
  out.hexahedra = { cells: 1_000_000, buildMs: Math.round(hexBuildMs), ...(await benchCuts(hex)) };
  t = performance.now();
  const tet = datasetOf([withFlow(tetGrid(55, 55, 55))], '998,250 tetrahedra (55³ lattice, 6 tetrahedra per cube)');
  const tetBuildMs = performance.now() - t;
  out.tetrahedra = { cells: 6 * 55 ** 3, buildMs: Math.round(tetBuildMs), ...(await benchCuts(tet)) };
  return out;
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) console.log(JSON.stringify(await run(), null, 2));
