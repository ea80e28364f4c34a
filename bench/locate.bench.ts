/**
 * Locate benchmark: the cell tree and 1000-sample line probes on 1M hexahedra and on about 1M tetrahedra
 * built in memory (a gently warped 100³ lattice, and a 55³ lattice split into six tetrahedra per cube),
 * with a velocity vector and a pressure scalar at the points. Reported per mesh (see
 * `src/cli/benchStages/locate.ts`): the first line (no tree yet: a scan of the cell blocks it meets, their
 * build included), the tree build alone,
 * later lines, a line at every cell crossing and the point-location rate.
 * Goals (issue 4): first line faster than VTK 9.1's probe filter on the same machine (about 0.36 s on
 * 1M hexahedra, 0.23 s on 1M tetrahedra), later lines under 5 ms, tree under 0.4 s and ≤ 64 bytes/cell.
 * Not a test: run it on a quiet machine. Alone: `node bin/run-ts.mjs bench/locate.bench.ts`.
 */
import { benchLocate } from '../src/cli/benchStages/locate.ts';
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, withFields, type LatticeMap } from '../src/model/meshBuild.ts';
import type { Piece } from '../src/model/piece.ts';

function withFlow(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 0.1 * y; o[1] = -0.1 * x; o[2] = 4 * x * (1 - x) * y * (1 - y) + 0.01 * z; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - z) + x * y; }),
  ]);
}

/** A smooth warp of the unit cube (cells stay valid, faces become non-planar). */
const warp: LatticeMap = (u, v, w) => [u + 0.03 * Math.sin(Math.PI * v) * Math.sin(Math.PI * w), v + 0.03 * Math.sin(Math.PI * w) * Math.sin(2 * Math.PI * u), w + 0.02 * Math.sin(Math.PI * u)];

export async function run(): Promise<Record<string, unknown>> {
  const out: Record<string, unknown> = {};
  let t = performance.now();
  const hex = datasetOf([withFlow(hexGrid(100, 100, 100, warp))], '1M hexahedra (warped 100³ lattice)');
  out.hexahedra = { cells: 1_000_000, meshBuildMs: Math.round(performance.now() - t), ...(await benchLocate(hex)) };
  t = performance.now();
  const tet = datasetOf([withFlow(tetGrid(55, 55, 55, warp))], '998,250 tetrahedra (warped 55³ lattice, 6 per cube)');
  out.tetrahedra = { cells: 6 * 55 ** 3, meshBuildMs: Math.round(performance.now() - t), ...(await benchLocate(tet)) };
  out.goals = 'first line incl. its search structure < 360 ms (hex) / 230 ms (tet), VTK 9.1 probe filter on this machine; later lines < 5 ms; build < 400 ms; ≤ 64 bytes/cell';
  return out;
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) console.log(JSON.stringify(await run(), null, 2));
