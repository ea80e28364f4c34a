import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { toSharedDataset } from '../../src/parallel/sharedDataset.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { forceTotals, type ForceResult } from '../../src/surface/forces.ts';
import { getBoundaryFaces } from '../../src/surface/surfaceCache.ts';
import { surfaceLoads, type LoadOptions } from '../../src/surface/surfaceLoads.ts';
import { warmUpSurfaceKernels } from '../../src/surface/warmUp.ts';

const FIELDS = join(import.meta.dirname, '..', '..', 'sample-fields');

/** The numbers of a force total, as the bytes of their doubles (so −0 and +0, or one ulp, differ). */
function bits(r: ForceResult): string {
  const v = [r.area, r.grossForce, ...r.pressureForce, ...r.pressureMoment, ...(r.viscousForce ?? []), ...(r.viscousMoment ?? []),
    r.coefficients?.drag ?? NaN, r.coefficients?.lift ?? NaN, r.centreOfPressure?.offset ?? NaN];
  return Buffer.from(Float64Array.from(v).buffer).toString('hex');
}

/** Force totals over the whole boundary of `d` for each set of load options. */
function totals(d: Dataset, cases: Partial<LoadOptions>[]): string[] {
  const faces = getBoundaryFaces(d);
  const all = Int32Array.from({ length: faces.count }, (_, i) => i);
  return cases.map((o) => bits(forceTotals(d, faces, surfaceLoads(d, faces, all, o),
    { momentPoint: [0.1, -0.2, 0.3], reference: { rho: 1.2, speed: 3, area: 0.25, length: 0.5 } })));
}

describe('warming the surface kernels', () => {
  // Reference: the same force totals computed before the warm-up in this thread (each test file runs in a
  // fresh worker, so the kernels are cold here). The warm-up must change no result: same bits after it, on
  // the datasets computed before it (their boundary cached) and on the same files loaded again.
  it('runs once per thread and leaves no state behind: force totals on real files are the same bits before and after', async () => {
    const files: [string, Partial<LoadOptions>[]][] = [
      // tetrahedra around a sphere, point pressure and wall shear: the triangle loop and the general loop with traction
      ['sphere-stokes.vtu', [{ pressure: 'p', viscous: 'none' }, { pressure: 'p', viscous: 'wall-shear' }, { pressure: 'p', pRef: 2.5, kinematic: true, rho: 998.2, viscous: 'none' }]],
      // the same case with cell data: one value per face
      ['sphere-stokes-celldata.vtu', [{ pressure: 'p', viscous: 'none' }, { pressure: 'p', viscous: 'wall-shear' }]],
      // hexahedra of a pipe: quadrilateral faces (the fan of the general loop)
      ['pipe-coarse.vtu', [{ pressure: 'p', viscous: 'none' }, { pressure: 'p', pRef: -4, viscous: 'none' }]],
    ];
    const loaded = await Promise.all(files.map(([f]) => loadDatasetFile(join(FIELDS, f))));
    const before = loaded.map((d, i) => totals(d, files[i]![1]));
    const a = warmUpSurfaceKernels(), b = warmUpSurfaceKernels();
    expect(a).toBe(b);
    await a;
    // the pool's host warms on shared-memory copies too (a warm-up of its own)
    const shared = warmUpSurfaceKernels(toSharedDataset);
    expect(shared).not.toBe(a);
    expect(warmUpSurfaceKernels(toSharedDataset)).toBe(shared);
    await shared;
    const again = await Promise.all(files.map(([f]) => loadDatasetFile(join(FIELDS, f))));
    for (let i = 0; i < files.length; i++) {
      expect(totals(loaded[i]!, files[i]![1])).toEqual(before[i]);
      expect(totals(again[i]!, files[i]![1])).toEqual(before[i]);
      expect(totals(toSharedDataset(again[i]!), files[i]![1])).toEqual(before[i]);
    }
    // The totals are real ones: the sphere's wetted area is positive.
    const sphere = totals(loaded[0]!, [{ pressure: 'p', viscous: 'none' }])[0]!;
    expect(Buffer.from(sphere, 'hex').readDoubleLE(0)).toBeGreaterThan(0);
  });
});
