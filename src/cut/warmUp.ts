/**
 * Warming the cut and integral kernels before the first real cut.
 *
 * The engine optimises a hot loop only after it has run for a while, and recompiles it when a branch it
 * has not seen comes up; on the first cut of a session the kernels therefore run unoptimised over a
 * million cells (about 150 ms on 1M hexahedra, against 40–50 ms warm). Cutting a small mixed mesh of
 * hexahedra and tetrahedra with point and cell fields a few times, through both candidate searches, gives
 * the kernels their type feedback and their optimised code in about 0.1 s. The mesh goes through the XML
 * writer and reader so its pieces have the same shape as a loaded file's.
 *
 * The app's compute worker runs this once, when it is otherwise idle; the pool's share workers run it as they
 * start (`src/parallel/shareHost.ts`), while the file is still being read; the pool's host thread while the
 * workers take on their shares (it integrates every merged cut); the bench verb before it loads the file
 * (reported apart). It gives way to other tasks between cuts (each a few ms), so work it runs beside is held up
 * little. The result is thrown away.
 */
import { readDataset } from '../io/readDataset.ts';
import { writeVtu } from '../io/writeVtu.ts';
import { field, datasetOf, hexGrid, pointFieldFrom, tetGrid, tetsWithTriangles, withFields } from '../model/meshBuild.ts';
import type { Piece } from '../model/piece.ts';
import { warmUpScanLoops } from './crossingCells.ts';
import { integratePlane } from './planeIntegrals.ts';

function withFlow(p: Piece): Piece {
  const cells = p.cellTypes.length;
  const p64 = pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - z) + x * y; });
  // Files store fields as Float32 or Float64: the interpolation meets both kinds here, not first on a real file.
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 0.1 * y; o[1] = -0.1 * x; o[2] = 1 + x * (1 - x) + 0.01 * z; }),
    p64, field('p32', 'point', 1, Float32Array.from(p64.values)),
  ], [field('group', 'cell', 1, new Int32Array(cells).fill(1))]);
}

type V3 = [number, number, number];
const ON_NODES: [V3, V3][] = [[[0.5, 0.5, 0.5], [0, 0, 1]], [[0.4, 0.4, 0.4], [-1, 0.5, 0]], [[0.3, 0.5, 0.5], [1, 0, 0]], [[0.6, 0.6, 0.6], [0, -1, 0.5]]];

let warmed: Promise<void> | undefined;

/** Cuts and integrates a small mesh sixteen times (four planes through nodes); resolves when done. Runs once per thread (later calls share it). */
export function warmUpCutKernels(): Promise<void> {
  warmed ??= (async () => {
    warmUpScanLoops();
    const built = datasetOf([withFlow(hexGrid(10, 10, 10)), withFlow(tetGrid(5, 5, 5, (u, v, w) => [u, v, 1 + w])), withFlow(tetsWithTriangles(tetGrid(4, 4, 4, (u, v, w) => [u, v, 2 + w]), 3))], 'warm-up mesh');
    const d = await readDataset('warm-up mesh', writeVtu(built, { encoding: 'appended-raw' }));
    for (let i = 0; i < 12; i++) {
      const origin: [number, number, number] = [0.31 + 0.03 * i, 0.47, 0.2 + 0.23 * i];
      // Normals of both signs: on a lattice numbered along +x, +y, +z a positive normal always finds the node
      // below with the lower id, and the branches for the other order would first run on a real file.
      const normal: [number, number, number] = i % 4 === 0 ? [1, 0, 0] : i % 4 === 1 ? [0, 0.2, 1] : i % 4 === 2 ? [1, 1, 1] : [-0.4, 1, -0.7];
      integratePlane(d, { origin, normal, cut: { candidates: i < 6 ? 'scan' : 'tree' }, integral: { density: 1000 } });
      await new Promise<void>((resolve) => setTimeout(resolve, 0));
    }
    // Planes through the hexahedra's node layers and rows: the on-plane case tables (`onPlaneCases.ts`).
    for (const [origin, normal] of ON_NODES) {
      integratePlane(d, { origin, normal, cut: { candidates: 'scan' }, integral: { density: 1000 } });
      await new Promise<void>((resolve) => setTimeout(resolve, 0));
    }
  })();
  return warmed;
}
