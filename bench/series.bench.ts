/**
 * Series benchmark: a 200-step series of a 101,614-cell hexahedral mesh (47 × 47 × 46), written as
 * numbered appended-raw .vtu files with `TimeValue` field data into a temporary folder (velocity and
 * pressure point fields as Float32, changing every step; the mesh the same in every step), then three
 * cut-planes and one force total evaluated at every step through the streaming path of
 * `fieldtally history` (open with the TimeValue pass, read, reuse the mesh, evaluate, drop).
 * Goals (issue 11): all 200 steps in ≤ 10 s; peak memory ≤ 3 steps' decoded arrays plus the shared
 * geometry (cell tree and boundary faces, and what the evaluation keeps per mesh: the wall-gradient plan
 * of the force total and the three planes' cut geometry — each listed on its own). Memory: every 10th
 * step two full collections are forced (the second lets the first finish freeing buffers off-thread) and
 * the live array buffers (every typed array) are sampled while that step is still held — what streaming
 * keeps resident; the peak of unforced samples after every step is reported too (it includes garbage not
 * yet collected). The 40 forced collections are included in the times.
 * Then the same series on 2 worker threads (src/parallel/seriesPool.ts, runs of 100 steps each): wall and
 * process CPU (all threads), and whether its table equals the one-thread table number for number.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { join } from 'node:path';
import { nodeSeriesFiles, openSeriesInput } from '../src/cli/seriesInputs.ts';
import { writeVtu } from '../src/io/writeVtu.ts';
import { getCellTree } from '../src/locate/cellTree.ts';
import { datasetOf, field, hexGrid } from '../src/model/meshBuild.ts';
import { evaluateSeriesOnWorkers } from '../src/parallel/seriesPool.ts';
import { evaluateSeries } from '../src/series/evaluateSeries.ts';
import type { ProbeSet } from '../src/study/probeSet.ts';
import { getBoundaryFaces } from '../src/surface/surfaceCache.ts';
import { wallPlanBytes } from '../src/surface/wallGradientCache.ts';
import { evaluateProbeSet } from '../src/study/evaluate.ts';
import { cutCacheBytes } from '../src/cut/cutCache.ts';

const STEPS = 200, N = [47, 47, 46] as const;

/** Writes the series; returns the folder, bytes per file and the decoded bytes of one step. */
function writeSeries(): { dir: string; fileBytes: number; stepDecodedBytes: number } {
  const dir = mkdtempSync(join(tmpdir(), 'fieldtally-series-bench-'));
  const mesh = hexGrid(N[0], N[1], N[2], (u, v, w) => [u, v, 0.98 * w]);
  const n = mesh.points.length / 3, P = mesh.points;
  const vel = new Float32Array(3 * n), p = new Float32Array(n);
  let fileBytes = 0;
  for (let s = 0; s < STEPS; s++) {
    const t = 0.01 * s + 0.002 * Math.sin(s);
    const a = 1 + 0.1 * Math.sin(2 * Math.PI * 2.5 * t);
    for (let i = 0; i < n; i++) {
      const x = P[3 * i]!, y = P[3 * i + 1]!, z = P[3 * i + 2]!;
      vel[3 * i] = a * y * (1 - y) * 4; vel[3 * i + 1] = 0.05 * a * Math.sin(Math.PI * x); vel[3 * i + 2] = 0.01 * z;
      p[i] = 100 * a * (1 - x) + 3 * y * z;
    }
    const d = datasetOf([{ ...mesh, pointData: [field('velocity', 'point', 3, vel), field('p', 'point', 1, p)], cellData: [] }]);
    const bytes = writeVtu({ ...d, fieldData: [{ name: 'TimeValue', association: 'dataset', components: 1, values: Float64Array.of(t), sourceType: 'Float64' }] },
      { encoding: 'appended-raw', idType: 'Int32' });
    writeFileSync(join(dir, `flow_${String(s + 1).padStart(4, '0')}.vtu`), bytes);
    fileBytes = bytes.length;
  }
  const stepDecodedBytes = mesh.points.byteLength + mesh.connectivity.byteLength + mesh.offsets.byteLength + mesh.cellTypes.byteLength + vel.byteLength + p.byteLength;
  return { dir, fileBytes, stepDecodedBytes };
}

const SET: ProbeSet = {
  format: 'fieldtally-probe-set', version: 2,
  reference: { density: 1000, viscosity: 1e-3, speed: 1, area: 1, length: 1, dragDirection: [1, 0, 0], liftDirection: [0, 1, 0] },
  probes: [
    { id: 'inlet', kind: 'cut-plane', geometry: { origin: [0.1, 0.5, 0.5], normal: [1, 0, 0] }, fields: { velocity: 'velocity', pressure: 'p', density: 1000 } },
    { id: 'middle', kind: 'cut-plane', geometry: { origin: [0.5, 0.5, 0.5], normal: [1, 0.2, 0] }, fields: { velocity: 'velocity', pressure: 'p', density: 1000 } },
    { id: 'outlet', kind: 'cut-plane', geometry: { origin: [0.9, 0.5, 0.5], normal: [1, 0, 0.1] }, fields: { velocity: 'velocity', pressure: 'p', density: 1000 } },
    { id: 'wall', kind: 'force', geometry: { surfaces: [0, 1] }, options: { viscous: 'gradient' } },
  ],
};

export async function run(): Promise<Record<string, unknown>> {
  const g0 = performance.now();
  const { dir, fileBytes, stepDecodedBytes } = writeSeries();
  const generateMs = performance.now() - g0;
  try {
    setFlagsFromString('--expose-gc');
    const gc = runInNewContext('gc') as () => void;
    gc(); gc();
    const base = process.memoryUsage();
    let peakBuffers = 0, peakHeap = 0, peakRss = 0, peakLive = 0, stepNo = 0, gcWallMs = 0, gcCpuUs = 0;
    const c0 = process.cpuUsage(), t0 = performance.now();
    const index = await openSeriesInput([dir]);
    const openMs = performance.now() - t0;
    // time the reads apart from the evaluation (wall and CPU of `load` calls)
    let loadWallMs = 0, loadCpuUs = 0;
    const timedFiles = { ...nodeSeriesFiles, load: async (p: string, o?: Parameters<typeof nodeSeriesFiles.load>[1]) => {
      const w = performance.now(), c = process.cpuUsage();
      try { return await nodeSeriesFiles.load(p, o); } finally { loadWallMs += performance.now() - w; const d = process.cpuUsage(c); loadCpuUs += d.user + d.system; }
    } };
    const table = await evaluateSeries(index, timedFiles, SET, {
      onStep: () => {
        // twice: a collection first finishes freeing the buffers the one before let go (done off-thread, late on a busy machine)
        if (++stepNo % 10 === 0) {
          const w = performance.now(), c = process.cpuUsage();
          gc(); gc(); peakLive = Math.max(peakLive, process.memoryUsage().arrayBuffers - base.arrayBuffers);
          gcWallMs += performance.now() - w; const d = process.cpuUsage(c); gcCpuUs += d.user + d.system;
        }
        const m = process.memoryUsage();
        peakBuffers = Math.max(peakBuffers, m.arrayBuffers); peakHeap = Math.max(peakHeap, m.heapUsed); peakRss = Math.max(peakRss, m.rss);
      },
    });
    const wallMs = performance.now() - t0;
    const cpu = process.cpuUsage(c0);
    // the same steps on two threads (the index is open already; its time is in openMs above)
    const c2 = process.cpuUsage(), t2 = performance.now();
    const table2 = await evaluateSeriesOnWorkers(index, nodeSeriesFiles, SET, { workers: 2 });
    const wall2 = performance.now() - t2, cpu2 = process.cpuUsage(c2);
    const same = table2.time.length === table.time.length && table2.columns.length === table.columns.length
      && table.columns.every((c, i) => c.values.every((v, j) => Object.is(v, table2.columns[i]!.values[j])));
    // the shared geometry: cell tree and boundary faces of the (one) mesh, and the per-mesh caches the
    // evaluation keeps (wall-gradient plan, cut geometry), rebuilt here on a fresh copy of the first step
    const first = await nodeSeriesFiles.load(index.steps[0]!.files[0]!);
    const tree = getCellTree(first), faces = getBoundaryFaces(first);
    const treeAndFacesBytes = tree.bytes + faces.areaVector.byteLength + faces.centroid.byteLength + faces.nodes.byteLength + faces.points.byteLength;
    evaluateProbeSet(first, SET); evaluateProbeSet(first, SET);
    const wallPlan = wallPlanBytes(faces), cutGeometry = cutCacheBytes(first);
    const sharedBytes = treeAndFacesBytes + wallPlan + cutGeometry;
    const budget = 3 * stepDecodedBytes + sharedBytes;
    const peakTypedArrays = peakBuffers - base.arrayBuffers;
    return {
      steps: STEPS, cells: N[0] * N[1] * N[2], fileBytes, generateMs: Math.round(generateMs),
      openMs: Math.round(openMs), wallMs: Math.round(wallMs), cpuMs: Math.round((cpu.user + cpu.system) / 1000), goalMs: 10_000,
      twoWorkers: { wallMs: Math.round(wall2), cpuMs: Math.round((cpu2.user + cpu2.system) / 1000), sameTableAsOneThread: same, meshReuse: table2.meshReuse,
        note: 'evaluation only (series index opened before); one thread for comparison: wallMs - openMs' },
      forcedCollections: { wallMs: Math.round(gcWallMs), cpuMs: Math.round(gcCpuUs / 1000), note: 'the memory samples\' forced collections, included in wallMs and cpuMs above' },
      perStepWallMs: +(wallMs / STEPS).toFixed(1), readWallMs: Math.round(loadWallMs), readCpuMs: Math.round(loadCpuUs / 1000), meshReuse: table.meshReuse, failures: table.failures.length, timeSource: table.timeSource,
      memory: {
        stepDecodedBytes, sharedGeometryBytes: sharedBytes, budgetBytes: budget,
        shared: { cellTreeAndBoundaryFacesBytes: treeAndFacesBytes, wallGradientPlanBytes: wallPlan, cutGeometryBytes: cutGeometry },
        peakLiveArrayBufferBytes: peakLive, withinBudget: peakLive <= budget,
        peakArrayBufferGrowthUnforcedBytes: peakTypedArrays, peakHeapUsedBytes: peakHeap, peakRssBytes: peakRss,
        note: 'live = array buffers over the start of the run after two forced collections every 10th step (the step still held); unforced = peak of samples after every step, garbage included',
      },
      note: 'measured on a shared 2-core machine under heavy load from other jobs: wall time is inflated; cpuMs is the process CPU time',
    };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) console.log(JSON.stringify(await run(), null, 2));
