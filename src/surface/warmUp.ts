/**
 * Warming the boundary and force-total kernels before a file's first force total.
 *
 * A file's force total runs once, over a boundary of some ten thousand faces: about 10 ms, almost all of it
 * before the engine has optimised the face loop. The unoptimised loop keeps every double it makes on the heap,
 * so young-generation collections (up to 30 ms each on a busy virtual machine) decided the stage. Boundary
 * extraction runs its first call over a million cells the same way, optimised mid-loop. Extracting the
 * boundary of a few small meshes and integrating force totals over it, through every loop a loaded file takes,
 * gives these kernels their type feedback and optimised code first:
 *
 * - a hexahedral lattice (quadrilateral faces: the general loop of `forces.ts`), a lattice of tetrahedra with
 *   triangles on some of their faces (the 2D cells boundary extraction skips; the triangle loop of
 *   `pressureForceLoop.ts`), and both in one piece (a surface of triangles and quadrilaterals). Datasets of
 *   several pieces (points matched between pieces) are left cold;
 * - point pressure stored as Float32 (as the benchmark files store it) and as Float64 (the sample fields), and cell
 *   pressure;
 * - with no viscous part and with a wall-shear array (the traction lines of the general loop); with and
 *   without reference values.
 *
 * The meshes go through the XML writer and reader so their pieces have the same shape as a loaded file's.
 * The result is thrown away, and nothing is kept: the boundary and gradient caches are keyed by these meshes,
 * which are dropped. Callers run it where they run `warmUpCutKernels` (src/cut/warmUp.ts), beside the load;
 * it gives way to other tasks between steps (each a few ms).
 */
import { readDataset } from '../io/readDataset.ts';
import { writeVtu } from '../io/writeVtu.ts';
import { CellType } from '../model/cellTypes.ts';
import type { Dataset } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import { datasetOf, field, hexGrid, pieceFromCells, pointFieldFrom, tetGrid, tetsWithTriangles, withFields } from '../model/meshBuild.ts';
import type { Piece } from '../model/piece.ts';
import { oncePerShape, yieldNow } from '../model/warmUpRuns.ts';
import { forceTotals } from './forces.ts';
import { getBoundaryFaces } from './surfaceCache.ts';
import { surfaceLoads, type LoadOptions } from './surfaceLoads.ts';

/** Rounds of force totals on each mesh: enough calls of the 64-face loops for the engine to optimise them. */
const ROUNDS = 12;

const asFloat32 = (f: FieldArray): FieldArray => field(f.name, f.association === 'cell' ? 'cell' : 'point', f.components, Float32Array.from(f.values));

/** Pressure and wall shear on `p` (Float32 or Float64), and a cell pressure "pc". */
function withWallFields(p: Piece, float32: boolean): Piece {
  const pointData = [
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - z) + x * y; }),
    pointFieldFrom(p, 'skinFriction', 3, (x, y, z, o) => { o[0] = 0.01 * z; o[1] = 0.02 * x; o[2] = 0.005 * (y - x); }),
  ];
  const cells = p.cellTypes.length, pc = new Float64Array(cells);
  for (let c = 0; c < cells; c++) pc[c] = 50 + (c % 17);
  const cellData = [field('pc', 'cell', 1, pc)];
  return withFields(p, float32 ? pointData.map(asFloat32) : pointData, float32 ? cellData.map(asFloat32) : cellData);
}

/** A hexahedral lattice and a tetrahedral one beside it (apart: no face shared) in one piece: a surface of quadrilaterals and triangles. */
function hexesAndTets(): Piece {
  const h = hexGrid(5, 5, 5), t = tetGrid(4, 4, 4, (u, v, w) => [u, v, 1.5 + w]);
  const shift = h.points.length / 3, types: number[] = [], nodes: number[][] = [];
  for (let c = 0; c < h.cellTypes.length; c++) { types.push(CellType.HEXAHEDRON); nodes.push(Array.from(h.connectivity.subarray(8 * c, 8 * c + 8))); }
  for (let c = 0; c < t.cellTypes.length; c++) { types.push(CellType.TETRA); nodes.push(Array.from(t.connectivity.subarray(4 * c, 4 * c + 4), (q) => q + shift)); }
  return pieceFromCells([...h.points, ...t.points], { types, nodes });
}

/** The warm-up meshes, through the writer and reader (see the file comment). */
async function warmUpMeshes(): Promise<Dataset[]> {
  const built = [
    datasetOf([withWallFields(hexGrid(8, 8, 8), true)], 'warm-up hexahedra'),
    datasetOf([withWallFields(tetsWithTriangles(tetGrid(6, 6, 6), 5), true)], 'warm-up tetrahedra'),
    datasetOf([withWallFields(hexesAndTets(), false)], 'warm-up mixed'),
  ];
  const out: Dataset[] = [];
  for (const d of built) out.push(await readDataset(d.source, writeVtu(d, { encoding: 'appended-raw' })));
  return out;
}

/** Every boundary face of `d` (as the force total over a whole boundary selects them). */
function allFaces(count: number): Int32Array {
  const all = new Int32Array(count);
  for (let i = 0; i < count; i++) all[i] = i;
  return all;
}

/**
 * The load options of round `r`: pressure-only most often (the common first call: the triangle loop on the
 * tetrahedra), then a wall-shear array (the general loop's traction lines) and cell pressure. The velocity
 * gradient routes are left cold: warming their fits cost about 80 ms more CPU (they run only when μ is given).
 */
function loadOptions(r: number): Partial<LoadOptions> {
  switch (r % 4) {
    case 0: case 2: return { pressure: 'p', viscous: 'none' };
    case 1: return { pressure: 'p', viscous: 'wall-shear' };
    default: return { pressure: 'pc', viscous: 'none' };
  }
}

/**
 * Extracts boundaries and integrates force totals on small meshes; resolves when done. Runs once per thread
 * (later calls share it). `reshape` gives the meshes the object shape the real datasets of this thread will
 * have when that differs from a reader's (the worker pool's host integrates on `toSharedDataset` copies,
 * whose objects the engine sees as another kind: the reader's shapes alone left its first force total
 * unoptimised); each `reshape` warms once.
 */
export const warmUpSurfaceKernels = oncePerShape(async (reshape) => {
  const meshes = (await warmUpMeshes()).map((d) => (reshape ? reshape(d) : d));
  for (let r = 0; r < ROUNDS; r++) {
    for (const d of meshes) {
      const faces = getBoundaryFaces(d);
      const loads = surfaceLoads(d, faces, allFaces(faces.count), loadOptions(r));
      forceTotals(d, faces, loads, r % 2 === 0 ? {} : { reference: { rho: 1.2, speed: 10, area: 0.5, length: 0.3 }, momentPoint: [0.5, 0.5, 0.5] });
      await yieldNow();
    }
  }
});
