/**
 * Derived-field and wall-quantity benchmark, meshes built in memory:
 *  - vorticity and Q-criterion on 1M hexahedra (100³ lattice, 1,030,301 nodes) with a smooth point velocity:
 *    the quadratic least-squares gradient at every node, then ω and Q. Goal 0.5 s. Three figures: `cold`
 *    (first field on a new mesh: the kernel's copy of it and its node → cells rows made), `secondFreshMesh` (the
 *    same on another new mesh), and `newStepSameMesh` (a new velocity array on the same geometry arrays — a series
 *    step: only the velocities are copied into the kernel),
 *    and that step again with the fit in JavaScript (`newStepSameMeshJavaScriptFit`; `kernel` says whether the
 *    WebAssembly SIMD kernel of src/derive/momentKernel.ts ran the others).
 *  - wall quantities on a ~100k-face wall (a 224 × 224 × 1 slab of hexahedra, the bottom face's 50,176 faces
 *    plus the top's: both 0.01-thick slab faces as one group) with the second-order wall gradient. Goal 0.2 s.
 *    Figures: `cold` (first request on the mesh: rows built, direct fit), `secondRequest` and
 *    `thirdRequest` (the same wall asked again), `newStepSameMesh` (best of three new velocity arrays on the
 *    same geometry). Later requests reuse the wall's fit as an operator (src/surface/wallGradientCache.ts)
 *    when its plan fits the size limit there; otherwise they fit afresh.
 *  - the same wall quantities with the wall nodes' gradient fitted by the worker pool (1 and 2 workers, a run of
 *    wall nodes each; src/parallel/deriveShares.ts `primeWallGradients`, as `fieldtally wall --workers N`): `cold`
 *    on a fresh pool and mesh, boundary faces and groups not timed.
 *  - the same vorticity and Q on the worker pool (1 and 2 workers, each fitting a range of nodes in the moment
 *    kernel — 1 worker over its own copy of the mesh, 2 over one copy in shared memory made on this thread,
 *    src/derive/sharedKernelMesh.ts — and writing that range's ω and Q into shared results;
 *    src/parallel/deriveShares.ts): `cold` on a fresh pool and mesh — the kernel's copy of the mesh and its
 *    node → cells rows are made in the timed part, as a first request makes them. Pool start-up and the copy
 *    into shared memory are not timed; CPU time there is the whole process's (workers included), and each
 *    worker thread's (`cpuMsPerWorker`, from the workers' memory replies: /proc/thread-self/schedstat).
 * Every figure is wall time and CPU time (process.cpuUsage: the whole process, every thread); the machine is shared, so CPU time
 * is the steadier figure; `loadAverage` (1, 5, 15 min, from the OS) records how busy the machine was. Mesh and field building are not timed.
 */
import { withDerivedFields } from '../src/derive/derivedFields.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../src/model/meshBuild.ts';
import type { Dataset } from '../src/model/dataset.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../src/surface/surfaceCache.ts';
import { facesOfGroups } from '../src/surface/surfaceGroups.ts';
import { wallQuantities } from '../src/surface/wallQuantities.ts';
import { openNodePool } from '../src/parallel/nodePool.ts';
import type { WorkerMemory } from '../src/parallel/shareHost.ts';
import { primeDerivedGradients, primeWallGradients } from '../src/parallel/deriveShares.ts';
import { momentKernel, useMomentKernel } from '../src/derive/momentKernel.ts';
import { loadavg } from 'node:os';

interface Timing { ms: number; cpuMs: number }

function timed(fn: () => void): Timing {
  const c0 = process.cpuUsage(), t0 = performance.now();
  fn();
  const c = process.cpuUsage(c0);
  return { ms: performance.now() - t0, cpuMs: (c.user + c.system) / 1000 };
}

function bestOf(n: number, fn: (k: number) => void): Timing {
  let best = { ms: Infinity, cpuMs: Infinity };
  for (let i = 0; i < n; i++) { const t = timed(() => fn(i)); if (t.cpuMs < best.cpuMs) best = t; }
  return best;
}

const flow = (p: ReturnType<typeof hexGrid>) => withFields(p, [
  pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = Math.sin(3 * y) * z; o[1] = Math.cos(2 * x); o[2] = x * y; }),
  pointFieldFrom(p, 'p', 1, (x, _y, _z, o) => { o[0] = 1 - x; }),
]);

/** The dataset on the same geometry arrays with the velocity scaled by `a` (a later time step). */
function step(d: Dataset, a: number): Dataset {
  return {
    ...d, pieces: d.pieces.map((p) => ({
      ...p, pointData: p.pointData.map((f) => (f.name === 'velocity' ? { ...f, values: Float64Array.from(f.values, (x) => a * x) } : f)),
    })),
  };
}

export async function run(): Promise<Record<string, unknown>> {
  const out: Record<string, unknown> = {};
  {
    // a fresh dataset per cold run (the neighbour rows belong to the mesh); mesh building is not timed
    const make = (): Dataset => datasetOf([flow(hexGrid(100, 100, 100))], '1M hexahedra');
    const names = ['vorticity', 'q-criterion'];
    const d1 = make();
    const cold = timed(() => { withDerivedFields(d1, names); });
    const d2 = make();
    const second = timed(() => { withDerivedFields(d2, names); });
    const d3 = step(d2, 1.5);
    const sameMesh = timed(() => { withDerivedFields(d3, names); });
    // the same step with the fit in JavaScript (the WebAssembly kernel switched off)
    const d4 = step(d2, 2), kernel = momentKernel() !== null;
    useMomentKernel(false);
    const jsFit = timed(() => { withDerivedFields(d4, names); });
    useMomentKernel(true);
    out.vorticityAndQOn1MHexahedra = {
      cells: 1_000_000, nodes: 101 ** 3, goalMs: 500, threads: 1, kernel, cold, secondFreshMesh: second, newStepSameMesh: sameMesh,
      newStepSameMeshJavaScriptFit: jsFit, loadAverage: loadAverage(),
    };
    for (const workers of [1, 2]) {
      const pool = await openNodePool(make(), workers);
      const w0 = await pool.memory(), c0 = process.cpuUsage(), t0 = performance.now();
      await primeDerivedGradients(pool, names);
      withDerivedFields(pool.dataset, names);
      const c = process.cpuUsage(c0), ms = performance.now() - t0, w = workerCpu(w0, await pool.memory());
      await pool.close();
      out[`vorticityAndQOn1MHexahedraPool${workers}`] = { cells: 1_000_000, goalMs: 500, workers, cold: { ms, cpuMsAllThreads: (c.user + c.system) / 1000, cpuMsPerWorker: w }, loadAverage: loadAverage() };
    }
  }
  {
    const d = datasetOf([flow(hexGrid(224, 224, 1, (u, v, w) => [u, v, 0.01 * w]))], 'slab 224×224×1');
    const faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
    const big = groups.groups.map((g, i) => ({ g, i })).filter(({ g }) => g.faces > 10_000).map(({ i }) => i);
    const sel = facesOfGroups(groups, big);
    const opts = { density: 1, viscosity: 1e-3, speed: 1 };
    const cold = timed(() => { wallQuantities(d, faces, sel, opts); });
    const again = timed(() => { wallQuantities(d, faces, sel, opts); });
    const third = timed(() => { wallQuantities(d, faces, sel, opts); });
    const steps = [0.5, 2, 3].map((a) => step(d, a));
    const newStep = bestOf(3, (k) => { wallQuantities(steps[k]!, faces, sel, opts); });
    out.wallQuantitiesOn100kFaces = { faces: sel.length, goalMs: 200, threads: 1, cold, secondRequest: again, thirdRequest: third, newStepSameMesh: newStep, loadAverage: loadAverage() };
    for (const workers of [1, 2]) {
      // as `fieldtally wall --workers N`: the wall nodes' gradient on the pool (a run of nodes each), then the quantities here
      const pool = await openNodePool(datasetOf([flow(hexGrid(224, 224, 1, (u, v, w) => [u, v, 0.01 * w]))], 'slab 224×224×1'), workers);
      const pd = pool.dataset, pf = getBoundaryFaces(pd), pg = getSurfaceGroups(pd);
      const psel = facesOfGroups(pg, pg.groups.map((g, i) => ({ g, i })).filter(({ g }) => g.faces > 10_000).map(({ i }) => i));
      const w0 = await pool.memory(), c0 = process.cpuUsage(), t0 = performance.now();
      await primeWallGradients(pool, pd, pf, psel, opts);
      wallQuantities(pd, pf, psel, opts);
      const c = process.cpuUsage(c0), ms = performance.now() - t0, w = workerCpu(w0, await pool.memory());
      await pool.close();
      out[`wallQuantitiesOn100kFacesPool${workers}`] = { faces: psel.length, goalMs: 200, workers, cold: { ms, cpuMsAllThreads: (c.user + c.system) / 1000, cpuMsPerWorker: w }, loadAverage: loadAverage() };
    }
  }
  return out;
}

/** Each worker's thread CPU time between two `pool.memory()` replies (ms; null where the platform does not tell). */
function workerCpu(before: (WorkerMemory | null)[], after: (WorkerMemory | null)[]): (number | null)[] {
  return after.map((m, i) => (m?.cpuMs != null && before[i]?.cpuMs != null ? Math.round(m.cpuMs - before[i]!.cpuMs!) : null));
}

const loadAverage = (): number[] => loadavg().map((v) => Math.round(v * 10) / 10);

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) console.log(JSON.stringify(await run(), null, 2));
