/**
 * Warming the line-probe kernels before a file's first line probe.
 *
 * A file's first line builds the cell blocks (cellBlocks.ts: one pass over a million cells' connectivity)
 * and scans a few thousand cells (scanLocate.ts), all of it before the engine has optimised the loops: on
 * the 1M-tetrahedron benchmark file the scan of about 5000 cells took 27 ms cold against 2–5 ms warm, and
 * the block pass 44 against 30 ms. Probing lines through small meshes of the same kinds first — tetrahedra
 * followed by triangles (the files' boundary cells), hexahedra, several pieces — gives the block pass, the
 * block walk, the scan, the per-cell evaluation (barycentric and Newton), the sample writer (Float32 and
 * Float64, point and cell fields) and, once the scan budget of a small mesh is spent, the cell-tree build
 * and its point location their type feedback and optimised code. Lines run along faces and through nodes
 * (the tie rule's branches) and partly outside the mesh (samples no cell holds).
 *
 * The meshes go through the XML writer and reader so their pieces have the same shape as a loaded file's.
 * Nothing is kept: the caches are keyed by these meshes, which are dropped. Callers run it where they run
 * `warmUpCutKernels` (src/cut/warmUp.ts); it gives way to other tasks between meshes.
 */
import { readDataset } from '../io/readDataset.ts';
import { writeVtu } from '../io/writeVtu.ts';
import type { Dataset } from '../model/dataset.ts';
import { datasetOf, field, hexGrid, pointFieldFrom, tetGrid, tetsWithTriangles, withFields } from '../model/meshBuild.ts';
import type { Piece } from '../model/piece.ts';
import { oncePerShape, yieldNow } from '../model/warmUpRuns.ts';
import { buildCellBlocks } from './cellBlocks.ts';
import { probeLine, type Vec3 } from './lineProbe.ts';

/** Rounds of lines on each mesh: the first ones scan, the later ones (scan budget spent) use the tree. */
const ROUNDS = 8;

/** Velocity and pressure as the benchmark files store them (Float32), a Float64 pressure, an Int32 cell group. */
function withFlow(p: Piece): Piece {
  const p64 = pointFieldFrom(p, 'p64', 1, (x, y, z, o) => { o[0] = 100 * (1 - z) + x * y; });
  const v = pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 0.1 * y; o[1] = -0.1 * x; o[2] = 1 + x * (1 - x) + 0.01 * z; });
  return withFields(p, [field('velocity', 'point', 3, Float32Array.from(v.values)), field('p', 'point', 1, Float32Array.from(p64.values)), p64],
    [field('group', 'cell', 1, new Int32Array(p.cellTypes.length).fill(1))]);
}

/** The warm-up meshes, through the writer and reader (see the file comment). */
async function warmUpMeshes(): Promise<Dataset[]> {
  const built = [
    datasetOf([withFlow(tetsWithTriangles(tetGrid(7, 7, 7), 4))], 'warm-up tetrahedra'),
    datasetOf([withFlow(hexGrid(9, 9, 9))], 'warm-up hexahedra'),
    datasetOf([withFlow(tetGrid(4, 4, 4)), withFlow(hexGrid(4, 4, 4, (u, v, w) => [u, v, 1 + w]))], 'warm-up pieces'),
  ];
  const out: Dataset[] = [];
  for (const d of built) out.push(await readDataset(d.source, writeVtu(d, { encoding: 'appended-raw' })));
  return out;
}

/** Line r of a round: oblique, along a lattice face (ties), through nodes, and reaching outside the mesh. */
function lineOf(r: number, zTop: number): [Vec3, Vec3] {
  switch (r % 4) {
    case 0: return [[0.013 + 0.01 * r, 0.21, 0.05], [0.97, 0.83 - 0.01 * r, 0.93 * zTop]];
    case 1: return [[0.5, 0.0, 0.25 * zTop], [0.5, 1.0, 0.75 * zTop]];
    case 2: return [[0, 0, 0], [1, 1, zTop]];
    default: return [[-0.2, 0.4 + 0.01 * r, 0.3], [1.2, 0.6, 0.6 * zTop]];
  }
}

/**
 * Builds cell blocks and probes lines on small meshes; resolves when done. Runs once per thread and `reshape`
 * (later calls share it): `reshape` gives the meshes the shape the thread's real datasets will have when that
 * differs from a reader's (a pool worker locates in its share's views, `shareDataset`).
 */
export const warmUpLocateKernels = oncePerShape(async (reshape) => {
  const meshes = (await warmUpMeshes()).map((d) => (reshape ? reshape(d) : d));
  for (const d of meshes) {
    const zTop = d.pieces.length > 1 ? 2 : 1;
    for (let b = 0; b < 3; b++) buildCellBlocks(d);
    // Sample counts differ so the scans' sample arrays differ in length, as on real lines.
    for (let r = 0; r < ROUNDS; r++) {
      const [a, b] = lineOf(r, zTop);
      probeLine(d, a, b, { samples: 200 + 7 * r });
    }
    await yieldNow();
  }
});
