/**
 * The pool's cut merged in place (src/parallel/placeCuts.ts): where each share's runs go, and the merged cut
 * for 1 and 2 workers against the single-thread cut, array by array, also when two cuts are in flight at once
 * and after a cut that failed. Expected values are the single-thread core's own (`cutPlane` on the whole
 * dataset) and hand-worked offsets.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cutPlane, type PlaneCut } from '../../src/cut/cutPlane.ts';
import type { Vec3 } from '../../src/cut/triangleSet.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { openNodePool } from '../../src/parallel/nodePool.ts';
import { planCutRuns } from '../../src/parallel/placeCuts.ts';
import type { ComputePool } from '../../src/parallel/pool.ts';
import type { CutCounts } from '../../src/parallel/shareTasks.ts';

function counts(vertices: number, triangles: number, emitted: string[], triStart: number[], vertStart: number[], claimed: string[]): CutCounts {
  return {
    vertices, triangles, fields: [], candidateCells: 0, candidateSource: 'scan', cutCells: 0, openChains: 0, tolerance: 0, ms: 0,
    planeFaces: { emitted, triStart: Int32Array.from(triStart), vertStart: Int32Array.from(vertStart), claimed },
  };
}

describe('planCutRuns', () => {
  it('puts every share\'s cell triangles first, then the in-plane faces, dropping a face another share claimed', () => {
    // share 0: 4 cell triangles (6 vertices), no face of its own, claims face "f";
    // share 1: 2 cell triangles (4 vertices), then face "f" (2 triangles, 4 vertices) and face "g" (1 triangle, 3 vertices).
    const plan = planCutRuns([
      counts(6, 4, [], [4], [6], ['f']),
      counts(11, 5, ['f', 'g'], [2, 4, 5], [4, 8, 11], []),
    ]);
    expect(plan.triangles).toBe(4 + 2 + 1);
    expect(plan.vertices).toBe(6 + 4 + 3);
    expect(plan.kept).toBe(1);
    expect(plan.dropped).toBe(1);
    expect(Array.from(plan.runs[0]!)).toEqual([0, 4, 0, 6, 0, 0]);
    // cell run to triangle 4, vertex 6; face "g" (triangles 4 … 4, vertices 8 … 10) after every cell run
    expect(Array.from(plan.runs[1]!)).toEqual([0, 2, 0, 4, 4, 6, 4, 5, 8, 11, 6, 10]);
  });
});

function flowBox(): Dataset {
  const p = hexGrid(12, 9, 10);
  return datasetOf([withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = y; o[1] = -x; o[2] = 1 + x * z; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = x + 2 * y - z; }),
  ])], 'flow box');
}

function expectSameCut(a: PlaneCut, b: PlaneCut): void {
  expect(Array.from(a.positions)).toEqual(Array.from(b.positions));
  expect(Array.from(a.indices)).toEqual(Array.from(b.indices));
  expect(Array.from(a.sourceCell)).toEqual(Array.from(b.sourceCell));
  expect(Array.from(a.vertexEdges)).toEqual(Array.from(b.vertexEdges));
  expect(Array.from(a.vertexT)).toEqual(Array.from(b.vertexT));
  expect(a.fields.map((f) => f.name)).toEqual(b.fields.map((f) => f.name));
  a.fields.forEach((f, j) => expect(Array.from(f.values)).toEqual(Array.from(b.fields[j]!.values)));
  expect(a.stats.cutCells).toBe(b.stats.cutCells);
  expect(a.stats.boundaryFaces).toBe(b.stats.boundaryFaces);
}

const PLANES: [Vec3, Vec3][] = [
  [[0.5, 0.5, 0.5], [0, 0, 1]],          // a node layer across the share border (in-plane faces)
  [[0.41, 0.37, 0.52], [0.3, -0.5, 0.8]],
  [[0.25, 0.5, 0.5], [1, 0, 0]],          // a node layer along the cells' order
];

for (const workers of [1, 2]) {
  describe(`cut merged in place, ${workers} worker(s)`, () => {
    let d: Dataset, pool: ComputePool;
    beforeAll(async () => { d = flowBox(); pool = await openNodePool(d, workers); }, 60_000);
    afterAll(async () => { await pool?.close(); });

    it('equals the single-thread cut array for array, its arrays in shared memory', async () => {
      for (const [o, n] of PLANES) {
        const c = await pool.cutPlane(o, n);
        expectSameCut(c, cutPlane(d, o, n));
        expect(c.positions.buffer).toBeInstanceOf(SharedArrayBuffer);
      }
    });

    it('reports each worker\'s share of the cut: candidates and triangles adding up to the merged cut\'s', async () => {
      for (const [o, n] of PLANES) {
        const c = await pool.cutPlane(o, n), one = cutPlane(d, o, n, { planeFaceKeys: true });
        const shares = c.stats.shares!;
        expect(shares).toHaveLength(workers);
        expect(shares.reduce((s, x) => s + x.candidateCells, 0)).toBe(one.stats.candidateCells);
        // triangles of cells, plus in-plane faces a share added that another share cut from the cell below (dropped in the merge)
        expect(shares.reduce((s, x) => s + x.triangles, 0)).toBeGreaterThanOrEqual(c.sourceCell.length);
        for (const x of shares) expect(x.ms).toBeGreaterThanOrEqual(0);
      }
    });

    it('keeps two cuts in flight at once apart', async () => {
      const both = await Promise.all(PLANES.map(([o, n]) => pool.cutPlane(o, n)));
      both.forEach((c, i) => expectSameCut(c, cutPlane(d, ...PLANES[i]!)));
    });

    it('gives an empty cut for a plane that misses the mesh', async () => {
      const c = await pool.cutPlane([0.5, 0.5, 3], [0, 0, 1]);
      expect(c.empty).toBe(true);
      expect(c.indices.length).toBe(0);
      expectSameCut(c, cutPlane(d, [0.5, 0.5, 3], [0, 0, 1]));
    });

    it('reports a failed cut with the worker\'s message, and cuts again after it', async () => {
      await expect(pool.cutPlane([0.5, 0.5, 0.5], [0, 0, 0])).rejects.toThrow(/cutPlane: normal/);
      expectSameCut(await pool.cutPlane(...PLANES[1]!), cutPlane(d, ...PLANES[1]!));
    });
  });
}
