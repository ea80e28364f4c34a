import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { datasetBounds } from '../../src/model/bounds.ts';
import { totalCells, type Dataset } from '../../src/model/dataset.ts';
import { probeLine, type LineProbeResult, type Vec3 } from '../../src/locate/lineProbe.ts';
import { warmUpLocateKernels } from '../../src/locate/warmUp.ts';
import { shareDataset } from '../../src/parallel/shares.ts';

const FIELDS = join(import.meta.dirname, '..', '..', 'sample-fields');

/** Every number of a line probe as the bytes of its doubles (so −0 and +0, or one ulp, differ), with its cells. */
function bits(r: LineProbeResult): string {
  const v: number[] = [r.count, r.validCount, ...r.s, ...r.x, ...r.y, ...r.z, ...r.cell, ...r.valid, ...r.intervalInside];
  for (const f of r.fields) for (const c of f.columns) v.push(...c);
  return Buffer.from(Float64Array.from(v).buffer).toString('hex');
}

/** Lines through the dataset's box (fractions of its bounds): oblique, along an axis, reaching outside. */
function lines(d: Dataset): [Vec3, Vec3][] {
  const b = datasetBounds(d);
  const at = (fx: number, fy: number, fz: number): Vec3 => [b[0] + fx * (b[1] - b[0]), b[2] + fy * (b[3] - b[2]), b[4] + fz * (b[5] - b[4])];
  return [[at(0.01, 0.2, 0.3), at(0.99, 0.8, 0.7)], [at(0.5, 0, 0.5), at(0.5, 1, 0.5)], [at(-0.1, 0.45, 0.4), at(1.1, 0.55, 0.6)]];
}

const probeAll = (d: Dataset) => lines(d).map(([a, b], i) => bits(probeLine(d, a, b, { samples: 301 + 2 * i })));

describe('warming the line-probe kernels', () => {
  // Reference: the same lines probed before the warm-up in this thread (each test file runs in a fresh
  // worker, so the kernels are cold here). The warm-up must change no result: same bits after it, on the
  // datasets probed before it (their cell blocks cached) and on the same files loaded again.
  it('runs once per thread and shape and leaves no state behind: line samples on real files are the same bits before and after', async () => {
    // tetrahedra around a sphere; hexahedra of a pipe; wedges and hexahedra; cell data
    const files = ['sphere-stokes.vtu', 'pipe-coarse.vtu', 'pipe-wedge-core.vtu', 'sphere-stokes-celldata.vtu'];
    const loaded = await Promise.all(files.map((f) => loadDatasetFile(join(FIELDS, f))));
    const before = loaded.map(probeAll);
    const a = warmUpLocateKernels(), b = warmUpLocateKernels();
    expect(a).toBe(b);
    await a;
    // pool workers warm on share views (a warm-up of its own per shape)
    const view = (d: Dataset) => shareDataset(d, { start: 0, end: totalCells(d) });
    const shared = warmUpLocateKernels(view);
    expect(shared).not.toBe(a);
    expect(warmUpLocateKernels(view)).toBe(shared);
    await shared;
    expect(loaded.map(probeAll)).toEqual(before);
    const again = await Promise.all(files.map((f) => loadDatasetFile(join(FIELDS, f))));
    expect(again.map(probeAll)).toEqual(before);
    // some samples of every file lie in the mesh and some outside (the lines reach past the bounds)
    for (const d of loaded) {
      const r = lines(d).map(([p, q]) => probeLine(d, p, q, { samples: 301 }));
      expect(r.some((x) => x.validCount > 0)).toBe(true);
      expect(r[2]!.validCount).toBeLessThan(301);
    }
  });
});
