/**
 * Bench stage `surface`: boundary extraction (first run and the best of the repeats), grouping (group array
 * or feature angle), and the force total over all boundary faces (first, best and median of 10 runs) —
 * pressure plus the wall-shear array when the file has one, and separately the viscous force from the
 * velocity gradient when it has a velocity array.
 */
import type { Dataset } from '../../model/dataset.ts';
import type { ComputePool } from '../../parallel/pool.ts';
import { boundaryFaces, type BoundaryFaces } from '../../surface/boundaryFaces.ts';
import { forceTotals } from '../../surface/forces.ts';
import { surfaceGroups } from '../../surface/surfaceGroups.ts';
import { surfaceLoads } from '../../surface/surfaceLoads.ts';
import type { BenchStage } from './stage.ts';

const r2 = (v: number) => Math.round(v * 100) / 100;

/** Bytes of the typed arrays an object holds, itself and one level down (a boundary and its point merge). */
function heldBytes(o: object, depth = 1): number {
  let n = 0;
  for (const v of Object.values(o)) {
    if (ArrayBuffer.isView(v)) n += v.byteLength;
    else if (v && typeof v === 'object' && depth > 0) n += heldBytes(v as object, depth - 1);
  }
  return n;
}

/** Times the surface pipeline on a dataset; `repeats` extraction runs after the first. */
export async function benchSurface(d: Dataset, repeats = 2): Promise<Record<string, unknown>> {
  let t = performance.now();
  let faces = boundaryFaces(d);
  const firstMs = performance.now() - t;
  const again: number[] = [];
  for (let i = 0; i < repeats; i++) {
    t = performance.now();
    faces = boundaryFaces(d);
    again.push(performance.now() - t);
  }
  return groupsAndForce(d, faces, {
    boundaryFaces: faces.count, cells3d: faces.cells3d, pointMatching: faces.merge.method, boundaryBytes: heldBytes(faces),
    extraction: { firstMs: r2(firstMs), bestMs: r2(Math.min(firstMs, ...again)), runs: 1 + repeats },
  });
}

/**
 * The surface benchmark with the boundary extracted by the worker pool (`ComputePool.boundary`: each worker its
 * share's faces, merged here; once — the pool keeps it), then grouping and force totals on this thread as above.
 */
export async function benchPoolSurface(pool: ComputePool): Promise<Record<string, unknown>> {
  const t = performance.now();
  const faces = await pool.boundary();
  const firstMs = performance.now() - t;
  return groupsAndForce(pool.dataset, faces, {
    boundaryFaces: faces.count, cells3d: faces.cells3d, pointMatching: faces.merge.method, boundaryBytes: heldBytes(faces),
    extraction: { firstMs: r2(firstMs), bestMs: r2(firstMs), runs: 1, workers: pool.size },
  });
}

/** Grouping and the force totals over every boundary face, added to `out`. */
function groupsAndForce(d: Dataset, faces: BoundaryFaces, out: Record<string, unknown>): Record<string, unknown> {
  let t = performance.now();
  const groups = surfaceGroups(d, faces);
  const groupMs = performance.now() - t;
  out.grouping = { ms: r2(groupMs), groups: groups.groups.length, source: groups.groupArray ? `cell array "${groups.groupArray}"` : `feature angle ${groups.featureAngle}°` };
  const all = Int32Array.from({ length: faces.count }, (_, i) => i);
  const pressureName = d.pieces[0]?.pointData.find((f) => /^(p|pressure)$/i.test(f.name) && f.components === 1)?.name;
  if (!pressureName || faces.count === 0) {
    out.force = { skipped: 'no point array named p or pressure' };
    return out;
  }
  // 'auto' without μ: pressure plus the wall-shear array when there is one; 'gradient': from the velocity.
  const timeForce = (viscous: 'auto' | 'gradient') => {
    const ms: number[] = [];
    let loadsMs = 0, method = '';
    for (let i = 0; i < 10; i++) {
      const t0 = performance.now();
      const loads = surfaceLoads(d, faces, all, { pressure: pressureName, viscous, ...(viscous === 'gradient' ? { mu: 1e-3 } : {}) }, groups.faceSurfaceCell);
      const t1 = performance.now();
      forceTotals(d, faces, loads);
      ms.push(performance.now() - t0);
      loadsMs = t1 - t0; method = loads.viscous.method;
    }
    const sorted = [...ms].sort((x, y) => x - y);
    return {
      faces: faces.count, firstMs: r2(ms[0]!), bestMs: r2(sorted[0]!), medianMs: r2(sorted[5]!), runs: ms.length,
      gatherMsLast: r2(loadsMs), viscous: method,
    };
  };
  out.force = timeForce('auto');
  if (d.pieces[0]!.pointData.some((f) => /^(velocity|u|vel)$/i.test(f.name) && f.components === 3)) out.forceFromGradient = timeForce('gradient');
  return out;
}

const stage: BenchStage = {
  name: 'surface',
  order: 40,
  run: (d) => benchSurface(d),
  runOnPool: (pool) => benchPoolSurface(pool),
};
export default stage;
