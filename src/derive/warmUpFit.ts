/**
 * Warming the gradient fit before the first real one, in a worker of the pool.
 *
 * A fresh worker runs its first gradient share with cold code: the ring choice and the copy of neighbour
 * offsets into the moment kernel (pairedFit.ts, neighbourRing.ts), the rows of a node range or a node list
 * (localStencil.ts) and the kernel itself (WebAssembly, compiled first by the baseline tier) are optimised
 * only after they have run for a while, and the early garbage of a small heap is collected more often. On the
 * 100k-face wall that made a pool of two slower than one thread. Fitting the gradient of small meshes —
 * hexahedra and tetrahedra, a node range and a node list with one-sided (two-ring) nodes, 1 and 3 components —
 * a few times gives that code its type feedback and its optimised versions, in about 0.15 s of CPU.
 *
 * The pool's share workers run it as they start, after the cut warm-up (`src/parallel/shareHost.ts`), while
 * the file is still being read. It gives way to other tasks between fits. The results are thrown away.
 */
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, withFields } from '../model/meshBuild.ts';
import type { Piece } from '../model/piece.ts';
import { pointGradientAt } from './fieldGradient.ts';
import { pointGradientRange } from './rangeGradient.ts';

function withFlow(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = Math.sin(3 * y) * z; o[1] = Math.cos(2 * x) + z * z; o[2] = x * y; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 1 - x + y * z; }),
  ]);
}

/** The nodes of `p` on the plane z = `z` (a wall: their one-rings are one-sided, so they take the two-ring). */
function nodesAt(p: Piece, z: number): Int32Array {
  const list: number[] = [];
  for (let i = 0; i < p.points.length / 3; i++) if (p.points[3 * i + 2] === z) list.push(i);
  return Int32Array.from(list);
}

/** Rounds of fits; each runs every case once. */
const ROUNDS = 6;

let warmed: Promise<void> | undefined;

/** Fits the gradient on small meshes a few times; resolves when done. Runs once per thread (later calls share it). */
export function warmUpFitKernels(): Promise<void> {
  warmed ??= (async () => {
    const pieces = datasetOf([withFlow(hexGrid(14, 14, 6)), withFlow(tetGrid(7, 7, 4))], 'fit warm-up mesh').pieces;
    for (let r = 0; r < ROUNDS; r++) {
      for (const p of pieces) {
        const np = p.points.length / 3;
        for (const f of p.pointData) {
          const out = new Float64Array(3 * f.components * np), half = np >> 1;
          // a node range as a share gets it (rows of the range and its neighbours), then the rest
          pointGradientRange(p, f.values, f.components, 0, half, out);
          pointGradientRange(p, f.values, f.components, half, np, out);
          // a node list as a wall share gets it: rows around the list, two-ring fits (a new list each round)
          pointGradientAt(p, f, nodesAt(p, r % 2 === 0 ? 0 : 1));
        }
        await new Promise<void>((resolve) => setTimeout(resolve, 0));
      }
    }
  })();
  return warmed;
}
