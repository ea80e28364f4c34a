/**
 * Workers started and warmed before a file is read (`workersWarm`, src/parallel/nodePool.ts): the answer to a
 * `memory` request marks a worker that has loaded its code and warmed its kernels; the same workers then hold a
 * dataset as fresh ones do, and a cut on them equals the single-thread core's exactly.
 */
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { datasetBounds } from '../../src/model/bounds.ts';
import { openNodePool, startNodeWorkers, workersWarm } from '../../src/parallel/nodePool.ts';

const SAMPLES = resolve(__dirname, '../../sample-fields');

describe('workers warmed before the load', () => {
  it('answer once warm, then hold the dataset and cut it as the single-thread core does', async () => {
    const ports = startNodeWorkers(2);
    await workersWarm(ports);
    const d = await loadDatasetFile(`${SAMPLES}/sphere-stokes.vtu`);
    const pool = await openNodePool(d, 2, ports);
    try {
      const b = datasetBounds(d);
      const q = { origin: [(b[0]! + b[1]!) / 2, (b[2]! + b[3]!) / 2, (b[4]! + b[5]!) / 2] as [number, number, number], normal: [1, 0.2, 0] as [number, number, number] };
      const one = integratePlane(d, q), two = await pool.integratePlane(q);
      expect(two.integrals.triangles).toBe(one.integrals.triangles);
      expect(two.integrals.triangles).toBeGreaterThan(0);
      expect(two.integrals.area).toBe(one.integrals.area);
      expect(Array.from(two.cut.positions)).toEqual(Array.from(one.cut.positions));
    } finally {
      await pool.close();
    }
  });
});
