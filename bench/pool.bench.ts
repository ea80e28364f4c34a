/**
 * Worker-pool benchmark: the same stages on 1M hexahedra (100³ lattice, velocity and pressure point fields,
 * built in memory) with 1 and with 2 compute workers, and in this process on the single-thread core:
 * pool start (shared copy + worker start + share hand-over), first cut with integrals, later cut, first line
 * of 1000 samples, later line, boundary extraction, force total (boundary from the pool, then groups, loads
 * and sums here). Each stage gives wall time and the process's CPU time (all threads), in ms, so a busy
 * machine shows as wall > CPU / workers. Memory: the shared copy's bytes, the process's resident-set growth,
 * and per worker after every stage ran its JS heap and its own array buffers (cell tree, scratch; the shared
 * arrays are not counted there).
 * Load: the same mesh written as appended zlib (.vtu, 32 KiB blocks, level 6) to a temporary file and read
 * with zlib blocks inflated in this thread, and by 1 and 2 inflate workers (src/parallel/inflatePool.ts).
 */
import { mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadDatasetFile } from '../src/io/nodeFiles.ts';
import { writeVtu } from '../src/io/writeVtu.ts';
import { startInflatePool } from '../src/parallel/inflatePool.ts';
import { integratePlane } from '../src/cut/planeIntegrals.ts';
import { probeLine } from '../src/locate/lineProbe.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../src/model/meshBuild.ts';
import type { Dataset } from '../src/model/dataset.ts';
import { openNodePool } from '../src/parallel/nodePool.ts';
import { datasetBytes } from '../src/parallel/sharedDataset.ts';
import { forceTotals } from '../src/surface/forces.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../src/surface/surfaceCache.ts';
import { facesOfGroups } from '../src/surface/surfaceGroups.ts';
import { surfaceLoads } from '../src/surface/surfaceLoads.ts';

const r1 = (v: number) => Math.round(v * 10) / 10;

interface Timed { wallMs: number; cpuMs: number }

async function timed<T>(f: () => T | Promise<T>): Promise<[T, Timed]> {
  const c0 = process.cpuUsage(), t0 = performance.now();
  const v = await f();
  const c = process.cpuUsage(c0);
  return [v, { wallMs: r1(performance.now() - t0), cpuMs: r1((c.user + c.system) / 1000) }];
}

function mesh(): Dataset {
  const p = hexGrid(100, 100, 100);
  return datasetOf([withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 1 + z * (1 - z); o[1] = 0.1 * x; o[2] = 0.05 * y; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - x) + y * z; }),
  ])], '1M hexahedra');
}

const PLANE1 = { origin: [0.5003, 0.5, 0.5] as [number, number, number], normal: [1, 0.1, 0.05] as [number, number, number] };
const PLANE2 = { origin: [0.3, 0.5, 0.5] as [number, number, number], normal: [0.02, 1, 0.1] as [number, number, number] };
const LINE1: [[number, number, number], [number, number, number]] = [[0.001, 0.2, 0.3], [0.999, 0.8, 0.7]];
const LINE2: [[number, number, number], [number, number, number]] = [[0.5, 0.001, 0.1], [0.4, 0.999, 0.9]];

/** Force total over every boundary group of the (cached) boundary. */
function forceAll(d: Dataset) {
  const faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
  const sel = facesOfGroups(groups, groups.groups.map((_, i) => i));
  return forceTotals(d, faces, surfaceLoads(d, faces, sel, { pressure: 'p' }, groups.faceSurfaceCell));
}

async function withWorkers(d: Dataset, n: number): Promise<Record<string, unknown>> {
  const rss0 = process.memoryUsage().rss;
  const [pool, start] = await timed(() => openNodePool(d, n));
  try {
    const [c1, firstCut] = await timed(() => pool.integratePlane(PLANE1));
    const [, laterCut] = await timed(() => pool.integratePlane(PLANE2));
    const [l1, firstLine] = await timed(() => pool.probeLine(...LINE1, { samples: 1000 }));
    const [, laterLine] = await timed(() => pool.probeLine(...LINE2, { samples: 1000 }));
    const [b, boundary] = await timed(() => pool.boundary());
    const [f, force] = await timed(() => forceAll(pool.dataset));
    const shared = datasetBytes(pool.dataset);
    const rss = process.memoryUsage().rss - rss0;
    const workers = await pool.memory();
    return {
      workers: pool.size, start, firstCut, laterCut, firstLine, laterLine, boundary, force,
      check: { cutArea: c1.integrals.area, validSamples: l1.validCount, boundaryFaces: b.count, forceX: f.force[0] },
      memory: {
        sharedCopyBytes: shared, rssGrowthBytes: rss,
        perWorker: workers.map((m) => (m ? { heapUsedBytes: m.heapUsed, ownArrayBuffersBytes: m.arrayBuffers } : null)),
      },
    };
  } finally {
    await pool.close();
  }
}

async function inProcess(d: Dataset): Promise<Record<string, unknown>> {
  const [c1, firstCut] = await timed(() => integratePlane(d, PLANE1));
  const [, laterCut] = await timed(() => integratePlane(d, PLANE2));
  const [l1, firstLine] = await timed(() => probeLine(d, ...LINE1, { samples: 1000 }));
  const [, laterLine] = await timed(() => probeLine(d, ...LINE2, { samples: 1000 }));
  const [b, boundary] = await timed(() => getBoundaryFaces(d));
  const [f, force] = await timed(() => forceAll(d));
  return {
    workers: 0, firstCut, laterCut, firstLine, laterLine, boundary, force,
    check: { cutArea: c1.integrals.area, validSamples: l1.validCount, boundaryFaces: b.count, forceX: f.force[0] },
  };
}

/** Load times of a zlib file: inflated in this thread, then by 1 and 2 inflate workers (best of 2 each). */
async function loads(d: Dataset): Promise<Record<string, unknown>> {
  const dir = mkdtempSync(join(tmpdir(), 'fieldtally-poolbench-'));
  try {
    const file = join(dir, 'hex1m-zlib.vtu');
    writeFileSync(file, writeVtu(d, { encoding: 'zlib' }));
    const best = async (f: () => Promise<unknown>) => {
      const a = (await timed(f))[1], b = (await timed(f))[1];
      return a.wallMs <= b.wallMs ? a : b;
    };
    const out: Record<string, unknown> = { fileBytes: statSync(file).size, inThisThread: await best(() => loadDatasetFile(file)) };
    for (const n of [1, 2]) {
      const pool = startInflatePool(n);
      try { out[`${n}InflateWorkers`] = await best(() => loadDatasetFile(file, { inflate: pool.inflate })); } finally { await pool.close(); }
    }
    return out;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

export async function run(): Promise<Record<string, unknown>> {
  const d = mesh();
  const load = await loads(d);
  const one = await withWorkers(d, 1);
  const two = await withWorkers(d, 2);
  const core = await inProcess(mesh());
  const stages = ['firstCut', 'laterCut', 'firstLine', 'laterLine', 'boundary', 'force'] as const;
  const speedUp: Record<string, number> = {};
  for (const s of stages) speedUp[s] = Math.round(100 * (one[s] as Timed).wallMs / (two[s] as Timed).wallMs) / 100;
  return {
    cells: 1_000_000,
    note: 'wall and CPU ms per stage (CPU: all threads of the process); speedUp = wall(1 worker) / wall(2 workers); the machine may be shared, compare CPU too',
    load, oneWorker: one, twoWorkers: two, inProcessCore: core, speedUp,
  };
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) console.log(JSON.stringify(await run(), null, 2));
