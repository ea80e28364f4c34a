/**
 * Integral sums by blocks (`SUM_BLOCK` triangles, src/cut/integrals.ts): once the merged cut is placed, the
 * pool's workers sum its blocks in even runs (`blockSplit`) from the shared arrays, and the block sums are added in
 * block order, so 1, 2 and 3 workers give the one-thread integrals bit for bit and the same triangles.
 * Reference: the single-thread core of this repository on the same mesh (exact match, `toBe`/`toEqual`), and for
 * the blocks themselves a hand fold of `blockSums` over the set; the area of the cut against the exact area of
 * the plane's section of the box (its fields are linear, so their integrals are exact to rounding as well).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { integratePlane, type PlaneQuery } from '../../src/cut/planeIntegrals.ts';
import { blockSums, integrateSurface, SUM_BLOCK, sumLayout } from '../../src/cut/integrals.ts';
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, tetsWithTriangles, withFields } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { Piece } from '../../src/model/piece.ts';
import { openNodePool } from '../../src/parallel/nodePool.ts';
import { blockSplit, summedBlocks } from '../../src/parallel/placeCuts.ts';
import type { ComputePool } from '../../src/parallel/pool.ts';

function withFlow(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 1 + x - 0.3 * y; o[1] = 0.5 * y - z; o[2] = 2 - 4 * z + x; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 3 * x - y + z; }),
  ]);
}

/** 96×96×6 hexahedra then 24×24×6 tetrahedra with boundary triangles on [0,1]×[0,1]×[0,2]: a z-plane cut gives 18 432 triangles (five blocks) in the hexahedra. */
function bigBox(): Dataset {
  return datasetOf([withFlow(hexGrid(96, 96, 6)), withFlow(tetsWithTriangles(tetGrid(24, 24, 6, (u, v, w) => [u, v, 1 + w]), 5))], 'block box');
}

const planes: PlaneQuery[] = [
  { origin: [0.5, 0.5, 0.4], normal: [0.03, -0.02, 1], integral: { density: 998 } },
  { origin: [0.5, 0.5, 1.4], normal: [0.01, 0.02, -1], integral: { density: 998 } },
  { origin: [0.37, 0.5, 1], normal: [1, 0.02, 0.1] },
];

describe('integral sums by blocks', () => {
  let d: Dataset;
  const pools: ComputePool[] = [], defaults: boolean[] = [];
  beforeAll(async () => {
    d = bigBox();
    for (const n of [1, 2, 3]) { const pool = await openNodePool(d, n); defaults.push(pool.sumInWorkers); pool.sumInWorkers = true; pools.push(pool); }
  }, 120_000);
  afterAll(async () => { await Promise.all(pools.map((p) => p.close())); });

  it('one thread: the integral is the fold of the block sums in block order', () => {
    const r = integratePlane(d, planes[0]!);
    const set = r.cut, nt = set.indices.length / 3, nb = Math.ceil(nt / SUM_BLOCK);
    expect(nb).toBeGreaterThanOrEqual(3);
    const L = sumLayout(set.fields, planes[0]!.integral);
    const out = new Float64Array(nb * L.K), tri = { un: new Float64Array(3 * nt), rho: new Float64Array(3 * nt), area: new Float64Array(nt) };
    blockSums(set, L, 0, nt, 0, nb, tri, out);
    let area = out[0]!, q = out[4]!;
    for (let b = 1; b < nb; b++) { area += out[L.K * b]!; q += out[L.K * b + 4]!; }
    expect(r.integrals.area).toBe(area);
    expect(r.integrals.volumeFlowRate).toBe(q);
    // the same set integrated from blocks summed beforehand
    expect(integrateSurface(set, planes[0]!.integral, undefined, { sums: out, done: new Uint8Array(nb).fill(1), tri })).toEqual(r.integrals);
  });

  it('1, 2 and 3 workers give the one-thread integrals bit for bit, with blocks summed in the workers', async () => {
    for (const q of planes) {
      const one = integratePlane(d, q);
      for (const pool of pools) {
        const r = await pool.integratePlane(q);
        expect(Array.from(r.cut.indices)).toEqual(Array.from(one.cut.indices));
        expect(Array.from(r.cut.positions)).toEqual(Array.from(one.cut.positions));
        expect(r.integrals).toEqual(one.integrals);
        const s = summedBlocks(r.cut)!;
        expect(s.done.length).toBe(Math.ceil(one.cut.sourceCell.length / SUM_BLOCK));
        // every block came from a worker, in even runs of blocks whichever share its triangles came from
        expect(s.done.every((b) => b === 1)).toBe(true);
      }
    }
  }, 120_000);

  it('a region is integrated on this thread from the merged cut, as one thread does', async () => {
    const q: PlaneQuery = { ...planes[0]!, region: [{ kind: 'rectangle', centre: [0.5, 0.5, 0.4], axis: [1, 0, 0], half: [0.3, 0.2] }] };
    const one = integratePlane(d, q);
    for (const pool of pools) expect((await pool.integratePlane(q)).integrals).toEqual(one.integrals);
  }, 60_000);

  it('the blocks are split evenly between the workers, in order, every block once', () => {
    for (const [nb, w] of [[11, 2], [2, 2], [1, 2], [9, 3], [2, 3], [0, 2]] as const) {
      const cuts = Array.from({ length: w + 1 }, (_, i) => blockSplit(nb, w, i));
      expect(cuts[0]).toBe(0);
      expect(cuts[w]).toBe(nb);
      for (let i = 0; i < w; i++) {
        expect(cuts[i + 1]! - cuts[i]!).toBeGreaterThanOrEqual(Math.floor(nb / w));
        expect(cuts[i + 1]! - cuts[i]!).toBeLessThanOrEqual(Math.ceil(nb / w));
      }
    }
  });

  it('a pool sums in its workers by default; switched off, this thread sums every block, with the same bits', async () => {
    expect(defaults).toEqual([true, true, true]);
    pools[1]!.sumInWorkers = false;
    const one = integratePlane(d, planes[0]!), r = await pools[1]!.integratePlane(planes[0]!);
    pools[1]!.sumInWorkers = true;
    expect(summedBlocks(r.cut)).toBeUndefined();
    expect(r.integrals).toEqual(one.integrals);
  }, 60_000);

  it('the cut area is the exact section of the box', () => {
    // z = 0.4 + (−0.03(x − 0.5) + 0.02(y − 0.5))/1 over the unit square: area = √(1 + 0.03² + 0.02²) (exact)
    const r = integratePlane(d, planes[0]!);
    expect(r.integrals.area).toBeCloseTo(Math.hypot(1, 0.03, 0.02), 12);
  });
});
