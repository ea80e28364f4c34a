/**
 * The worker pool gives what the single-thread core gives, for 1, 2 and 3 workers: cut-plane integrals
 * (whole cut, seeded region, planes through node layers and along piece interfaces), evenly spaced line
 * samples (cells, validity, every value) and boundary faces (every array), then force totals on the pool's
 * boundary. Reference: the single-thread core of this repository on the same files (exact match or ≤ 1e-12
 * relative), on sample fields with exact solutions and external files (VTK's own example data).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resolve } from 'node:path';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import type { SurfaceIntegrals } from '../../src/cut/integrals.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { probeLine } from '../../src/locate/lineProbe.ts';
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { datasetBounds } from '../../src/model/bounds.ts';
import { openNodePool } from '../../src/parallel/nodePool.ts';
import type { ComputePool } from '../../src/parallel/pool.ts';
import { boundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { loadExternal } from '../helpers/external.ts';

const SAMPLES = resolve(__dirname, '../../sample-fields');

/** Every number of two results equal to rounding (≤ 1e-12 relative to the larger magnitude). */
function expectSame(a: unknown, b: unknown, path = ''): void {
  if (typeof a === 'number' && typeof b === 'number') {
    if (Number.isNaN(a) || Number.isNaN(b)) { expect(Number.isNaN(a), path).toBe(Number.isNaN(b)); return; }
    const scale = Math.max(Math.abs(a), Math.abs(b));
    expect(Math.abs(a - b), `${path}: ${a} vs ${b}`).toBeLessThanOrEqual(1e-12 * scale);
    return;
  }
  if (ArrayBuffer.isView(a) && ArrayBuffer.isView(b)) {
    const x = a as unknown as ArrayLike<number>, y = b as unknown as ArrayLike<number>;
    expect(x.length, `${path} length`).toBe(y.length);
    for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) expectSame(x[i], y[i], `${path}[${i}]`);
    return;
  }
  if (a && b && typeof a === 'object' && typeof b === 'object') {
    const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
    for (const k of keys) expectSame((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`);
    return;
  }
  expect(a, path).toEqual(b);
}

/** The integrals without the timing-only fields. */
const integralsOf = (s: SurfaceIntegrals) => s;

/** A 6×5×4 hexahedral box [0,1]³ with a linear velocity and pressure (exact on any cut). */
function linearBox(): Dataset {
  const p = hexGrid(6, 5, 4);
  return datasetOf([withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 1 + x; o[1] = 0.5 * y; o[2] = 2 - z; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 3 * x - y + z; }),
  ])], 'linear box');
}

/** Two tetrahedral pieces side by side along x with duplicated interface points. */
function twoPieces(): Dataset {
  const a = tetGrid(3, 4, 4, (u, v, w) => [0.5 * u, v, w]), b = tetGrid(3, 4, 4, (u, v, w) => [0.5 + 0.5 * u, v, w]);
  const f = (p: ReturnType<typeof tetGrid>) => withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 1; o[1] = x; o[2] = y * z; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = x * y + z; }),
  ]);
  return datasetOf([f(a), f(b)], 'two pieces');
}

interface Case {
  name: string;
  load: () => Promise<Dataset>;
  /** Planes as [origin, normal], plus a seeded one when given. */
  planes: [number[], number[]][];
  seed?: [number[], number[], number[]];
}

/** Planes through the box's middle, a node layer, and tilted, from the bounds. */
function planesFor(d: Dataset): [number[], number[]][] {
  const b = datasetBounds(d);
  const c = [(b[0] + b[1]) / 2, (b[2] + b[3]) / 2, (b[4] + b[5]) / 2];
  return [[c, [1, 0, 0]], [c, [0.3, -0.4, 1]], [[b[0] + 0.37 * (b[1] - b[0]), c[1], c[2]], [0, 1, 0.2]]];
}

const CASES: Case[] = [
  { name: 'linear hexahedral box (plane through a node layer x = 0.5)', load: async () => linearBox(),
    planes: [[[0.5, 0.5, 0.5], [1, 0, 0]], [[0.5, 0.4, 0.5], [0, 1, 0]], [[0.5, 0.5, 0.5], [0, 0, 1]], [[0.5, 0.5, 0.25], [0, 0, -1]],
      [[0.5, 0.5, 0.5], [1, 1, 1]], [[0, 0.5, 0.5], [1, 0, 0]]] },
  { name: 'two tetrahedral pieces (plane on the interface x = 0.5)', load: async () => twoPieces(),
    planes: [[[0.5, 0.5, 0.5], [1, 0, 0]], [[0.3, 0.5, 0.5], [0, 0, 1]], [[0.3, 0.5, 0.5], [1, 2, 3]]] },
  { name: 'pipe-medium.vtu (hexahedra and a wedge core)', load: () => loadDatasetFile(`${SAMPLES}/pipe-medium.vtu`),
    planes: [[[0, 0, 0.05], [0, 0, 1]], [[0, 0, 0.025], [0.1, 0, 1]], [[0, 0, 0.05], [1, 0, 0]]],
    seed: [[0, 0, 0.05], [0, 0, 1], [0.001, 0.001, 0.05]] },
  { name: 'pipe-medium-celldata.vtu (cell data)', load: () => loadDatasetFile(`${SAMPLES}/pipe-medium-celldata.vtu`),
    planes: [[[0, 0, 0.05], [0, 0, 1]], [[0, 0.002, 0.05], [0, 1, 0]]] },
  { name: 'sphere-stokes-celldata.vtu (tetrahedra, wall groups)', load: () => loadDatasetFile(`${SAMPLES}/sphere-stokes-celldata.vtu`),
    planes: [[[0, 0, 0], [1, 0, 0]], [[0.3, 0.1, 0], [0, 1, 1]]] },
  { name: 'external vtk-data/polyhedron2pieces.vtu (polyhedra, two pieces)', load: () => loadExternal('vtk-data/polyhedron2pieces.vtu'), planes: [] },
  { name: 'external vtk-data/VTKCellTypes.vtk (every linear 3D type)', load: () => loadExternal('vtk-data/VTKCellTypes.vtk'), planes: [] },
  { name: 'external vtk-data/ex-blow_5.vtm (multiblock set)', load: () => loadExternal('vtk-data/ex-blow_5.vtm'), planes: [] },
];

describe.each([1, 2, 3])('worker pool with %i worker(s) equals the single-thread core', (workers) => {
  describe.each(CASES)('$name', (c) => {
    let d: Dataset, pool: ComputePool;
    beforeAll(async () => {
      d = await c.load();
      pool = await openNodePool(d, workers);
    });
    afterAll(async () => { await pool?.close(); });

    it('cut-plane integrals, triangles and region', async () => {
      const planes = c.planes.length ? c.planes : planesFor(d);
      for (const [o, n] of planes) {
        const q = { origin: o as [number, number, number], normal: n as [number, number, number] };
        const one = integratePlane(d, q), many = await pool.integratePlane(q);
        expect(many.integrals.triangles).toBe(one.integrals.triangles);
        expectSame(integralsOf(many.integrals), integralsOf(one.integrals), `${o}|${n}`);
        expectSame(many.cut.indices, one.cut.indices, 'indices');
        expectSame(many.cut.positions, one.cut.positions, 'positions');
        expectSame(many.cut.sourceCell, one.cut.sourceCell, 'sourceCell');
        expectSame(many.cut.vertexEdges, one.cut.vertexEdges, 'vertexEdges');
        expectSame(many.cut.fields, one.cut.fields, 'fields');
        expect(many.cut.stats.cutCells).toBe(one.cut.stats.cutCells);
        expect(many.cut.stats.boundaryFaces).toBe(one.cut.stats.boundaryFaces);
      }
      if (c.seed) {
        const [o, n, s] = c.seed;
        const q = { origin: o as [number, number, number], normal: n as [number, number, number], region: [{ kind: 'seed' as const, point: s as [number, number, number] }] };
        expectSame((await pool.integratePlane(q)).integrals, integratePlane(d, q).integrals, 'seeded');
      }
    });

    it('line samples: cell, validity and every value', async () => {
      const b = datasetBounds(d);
      const lines: [number, number, number][][] = [
        [[b[0] - 0.1 * (b[1] - b[0]), (b[2] + b[3]) / 2, (b[4] + b[5]) / 2], [b[1] + 0.1 * (b[1] - b[0]), (b[2] + b[3]) / 2, (b[4] + b[5]) / 2]],
        [[b[0], b[2], b[4]], [b[1], b[3], b[5]]],
      ];
      for (const [from, to] of lines) {
        let one;
        try { one = probeLine(d, from!, to!, { samples: 257 }); } catch (e) {
          // A file without volume cells: the pool refuses with the core's message.
          await expect(pool.probeLine(from!, to!, { samples: 257 })).rejects.toThrow((e as Error).message);
          continue;
        }
        expectSame(await pool.probeLine(from!, to!, { samples: 257 }), one, `${from}→${to}`);
      }
    });

    it('boundary faces: every array', async () => {
      const one = boundaryFaces(d), many = await pool.boundary();
      const { merge: m1, ...a } = one, { merge: m2, ...b } = many;
      expectSame(b, a, 'boundary');
      expectSame(m2, m1, 'merge');
    });
  });
});
