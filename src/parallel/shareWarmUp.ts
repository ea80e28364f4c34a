/**
 * Warming a share worker's cut path before its first real cut: the path `warmUpCutKernels` (src/cut/warmUp.ts)
 * does not take. A worker cuts a share view of a dataset posted to it in shared memory, with block boxes made
 * when it took the share on (`prepareCut`), so its first cut tests every block box and reads the crossed
 * blocks by coordinates or by side bytes, then writes its runs into the merged arrays (`placeCutShare`). On the
 * whole-mesh warm-up those loops run over a handful of blocks only, and a worker's first cut over half a
 * million cells then ran them unoptimised: 17 ms of a worker's CPU against 2–4 ms warm on the 1M-hexahedron
 * sample's first plane (profile, load average 0.3).
 *
 * Here a lattice of hexahedra and one of tetrahedra (with a few boundary triangles after them, as files store
 * them) go through shared memory and a structured clone, as a posted dataset does, are split into two shares,
 * and each share is cut and placed on planes that cross few blocks (coordinates) and many (side bytes), with
 * normals of both signs, and the integral's blocks are summed from the merged arrays (`sumCutBlocks`). Results
 * are thrown away; nothing is kept but the engine's compiled code.
 */
import { prepareCut } from '../cut/cutPlane.ts';
import { datasetOf, field, hexGrid, pointFieldFrom, tetGrid, tetsWithTriangles, withFields } from '../model/meshBuild.ts';
import type { Piece } from '../model/piece.ts';
import type { Vec3 } from '../cut/triangleSet.ts';
import { blockSplit, planCutRuns, shareSums } from './placeCuts.ts';
import { cutShare, placeCutShare, sumCutBlocks, type CutCounts, type SharedCutArrays } from './shareTasks.ts';
import { toSharedDataset } from './sharedDataset.ts';
import { shareDataset, splitCells } from './shares.ts';

/** Keys of the warm-up's cuts: negative, so they never meet the host's (which count up from 1). */
let key = -1;

function withFlow(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 0.1 * y; o[1] = -0.1 * x; o[2] = 1 + x * (1 - x) + 0.01 * z; }),
    field('p', 'point', 1, Float32Array.from(pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - z) + x * y; }).values)),
  ]);
}

/** Planes (origin, normal) through the unit-scaled lattices: a few blocks crossed, then many, normals of both signs. */
const PLANES: [Vec3, Vec3][] = [
  [[0.5, 0.5, 0.51], [0.02, 0.01, 1]], [[0.5, 0.5, 0.33], [-0.03, 0.02, -1]], [[0.41, 0.5, 0.5], [1, 0.02, 0.1]],
  [[0.5, 0.47, 0.5], [-0.1, -1, 0.05]], [[0.5, 0.5, 0.5], [1, 1, 1]], [[0.3, 0.6, 0.7], [-0.4, 1, -0.7]],
];

function shared<T>(ctor: { new (b: SharedArrayBuffer): T; BYTES_PER_ELEMENT: number }, n: number): T {
  return new ctor(new SharedArrayBuffer(n * ctor.BYTES_PER_ELEMENT));
}

/**
 * Cells along each side of the hexahedral lattice. At 16 (4 096 cells) the block scan's loops (`scan`,
 * `blocksMayCross`, `blockOf8` of crossingCells.ts) never got hot enough here to be optimised: they were compiled on
 * the engine's background threads during a file's first two or three cuts, 20–120 ms of CPU each per worker, beside
 * the workers on a two-core machine (1M hexahedra, pool of 2, load average ~5: the process's CPU for the first cut
 * 65 ms against 17 ms on the three threads, for the first later cut 113–127 against ~70). At 32 (32 768 cells) they
 * are optimised here: first cut 35 ms of process CPU (wall 59 → 32 ms), first later cut 65–68 (wall 124–126 → 65–67),
 * for about 200 ms more of this warm-up's CPU (200–210 → 400 ms), spent while the file loads.
 */
const HEX_SIDE = 32;

let warmed: Promise<void> | undefined;

/** Cuts and places shares of two small lattices `rounds` times over the planes; once per thread (later calls share it). */
export function warmUpShareKernels(rounds = 4): Promise<void> {
  warmed ??= (async () => {
    const hex = withFlow(hexGrid(HEX_SIDE, HEX_SIDE, HEX_SIDE)), tet = withFlow(tetsWithTriangles(tetGrid(9, 9, 9), 7));
    for (const built of [datasetOf([hex], 'warm-up lattice'), datasetOf([tet], 'warm-up lattice')]) {
      // as a dataset posted to a worker arrives: shared arrays inside freshly cloned objects
      const whole = structuredClone(toSharedDataset(built));
      const ranges = splitCells(whole.pieces[0]!.cellTypes.length, 2);
      const shares = ranges.map((r) => { const s = shareDataset(whole, r); prepareCut(s); return s; });
      for (let r = 0; r < rounds; r++) {
        for (const [origin, normal] of PLANES) {
          // one key per share: in this one thread both shares' cuts are held at once
          const keys = shares.map(() => key--);
          const parts: CutCounts[] = shares.map((s, i) => cutShare(s, keys[i]!, origin, normal, { candidates: 'scan' }));
          const plan = planCutRuns(parts);
          const nV = plan.vertices, nT = plan.triangles;
          const into: SharedCutArrays = {
            positions: shared(Float64Array, 3 * nV), indices: shared(Uint32Array, 3 * nT), sourceCell: shared(Int32Array, nT),
            vertexEdges: shared(Int32Array, 2 * nV), vertexT: shared(Float64Array, nV),
            fields: parts[0]!.fields.map((f) => shared(Float64Array, (f.association === 'point' ? nV : nT) * f.components)),
          };
          ranges.forEach((range, i) => placeCutShare(keys[i]!, range, plan.runs[i]!, into));
          // and sums half of the integral's blocks from the merged arrays, as op `sum` does
          const sums = nT > 0 ? shareSums(parts[0]!.fields, {}, nT) : null;
          if (sums) sumCutBlocks(into, parts[0]!.fields, sums, 0, blockSplit(sums.done.length, 2, 1) || 1);
        }
        await new Promise<void>((resolve) => setTimeout(resolve, 0));
      }
    }
  })();
  return warmed;
}
