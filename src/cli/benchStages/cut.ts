/**
 * Bench stage `cut`: planes at several positions and orientations through the dataset's bounds, cut and
 * integrated. The first cut (no tree yet: a linear scan of the cells), the tree build, and the later cuts
 * (tree query) are reported apart, with triangles per cut and memory.
 */
import { datasetScale } from '../../cut/cutPlane.ts';
import { integratePlane } from '../../cut/planeIntegrals.ts';
import type { Vec3 } from '../../cut/triangleSet.ts';
import { getCellTree } from '../../locate/cellTree.ts';
import { datasetBounds } from '../../model/bounds.ts';
import type { Dataset } from '../../model/dataset.ts';
import type { ComputePool } from '../../parallel/pool.ts';
import type { BenchStage } from './stage.ts';

/**
 * Twelve planes: three axis-normal positions per axis and three oblique ones, all through the bounds. The
 * middle axis planes of a regular lattice run through a layer of nodes (the in-plane face bookkeeping is
 * exercised); the others do not.
 */
export function benchPlanes(d: Dataset): { origin: Vec3; normal: Vec3 }[] {
  const b = datasetBounds(d);
  const at = (fx: number, fy: number, fz: number): Vec3 => [b[0] + fx * (b[1] - b[0]), b[2] + fy * (b[3] - b[2]), b[4] + fz * (b[5] - b[4])];
  const out: { origin: Vec3; normal: Vec3 }[] = [];
  for (const f of [0.3137, 0.5, 0.7291]) {
    out.push({ origin: at(f, 0.5, 0.5), normal: [1, 0, 0] }, { origin: at(0.5, f, 0.5), normal: [0, 1, 0] }, { origin: at(0.5, 0.5, f), normal: [0, 0, 1] });
  }
  out.push({ origin: at(0.5, 0.5, 0.5), normal: [1, 1, 1] }, { origin: at(0.4, 0.45, 0.55), normal: [1, 2, 3] }, { origin: at(0.6, 0.5, 0.4), normal: [-1, 1, 0.5] });
  return out;
}

const r2 = (v: number) => Math.round(v * 100) / 100;
const phases = (p: Readonly<Record<string, number>>) => Object.fromEntries(Object.entries(p).map(([k, v]) => [k, r2(v)]));
const stats = (a: number[]) => {
  const s = [...a].sort((x, y) => x - y);
  return { min: r2(s[0] ?? NaN), median: r2(s[Math.floor(s.length / 2)] ?? NaN), max: r2(s[s.length - 1] ?? NaN) };
};

/** Runs the cut benchmark on a dataset (the tree must not be built yet for the first-cut figure to mean anything). */
export async function benchCuts(d: Dataset): Promise<Record<string, unknown>> {
  const planes = benchPlanes(d);
  datasetScale(d);
  // With --expose-gc the memory figures are of live data; without it they include garbage not yet collected.
  const gc = (globalThis as { gc?: () => void }).gc;
  gc?.();
  const rss0 = process.memoryUsage().rss, ab0 = process.memoryUsage().arrayBuffers;
  let t = performance.now();
  const c0 = process.cpuUsage();
  let firstCut: Record<string, unknown>, fields: string[];
  {
    // In a block, so the first result is not kept alive through the memory figures below.
    const first = integratePlane(d, { ...planes[0]!, cut: { candidates: 'scan' } });
    const firstMs = performance.now() - t, cpu = process.cpuUsage(c0);
    // CPU time (process, every thread) moves far less than wall time with the machine's load.
    firstCut = { ms: r2(firstMs), cpuMs: r2((cpu.user + cpu.system) / 1000), cutOnlyMs: r2(first.cut.stats.ms), source: 'scan', triangles: first.cut.indices.length / 3, candidates: first.cut.stats.candidateCells };
    fields = first.cut.fields.map((f) => `${f.name} (${f.association})`);
  }
  t = performance.now();
  const treeCpu0 = process.cpuUsage();
  const tree = getCellTree(d);
  const treeMs = performance.now() - t, treeCpu = process.cpuUsage(treeCpu0);
  const cutMs: number[] = [], totalMs: number[] = [], tris: number[] = [], cells: number[] = [], bytes: number[] = [];
  let rssMax = 0, abMax = 0, liveMax = 0;
  for (let pass = 0; pass < 2; pass++) {
    for (const p of planes) {
      t = performance.now();
      const r = integratePlane(d, { ...p, cut: { candidates: 'tree' } });
      const ms = performance.now() - t;
      if (pass === 0) continue; // warm-up pass: the JIT has seen every path once
      totalMs.push(ms); cutMs.push(r.cut.stats.ms);
      tris.push(r.cut.indices.length / 3); cells.push(r.cut.stats.cutCells);
      let b = r.cut.positions.byteLength + r.cut.indices.byteLength + r.cut.sourceCell.byteLength + r.cut.vertexEdges.byteLength + r.cut.vertexT.byteLength;
      for (const f of r.cut.fields) b += f.values.byteLength;
      bytes.push(b);
      const m = process.memoryUsage();
      rssMax = Math.max(rssMax, m.rss - rss0); abMax = Math.max(abMax, m.arrayBuffers - ab0);
      if (gc) { gc(); liveMax = Math.max(liveMax, process.memoryUsage().arrayBuffers - ab0 - tree.bytes); }
    }
  }
  return {
    planes: planes.length,
    fields, firstCut,
    // CPU time beside wall time: the build runs on this thread alone, so on a busy machine its CPU time is the steadier figure
    treeBuildMs: r2(treeMs), treeBuildCpuMs: r2((treeCpu.user + treeCpu.system) / 1000), treeBuildPhasesMs: phases(tree.buildPhasesMs), treeBytes: tree.bytes,
    laterCuts: { cutAndIntegralsMs: stats(totalMs), cutOnlyMs: stats(cutMs), source: 'tree', triangles: stats(tris), cellsCut: stats(cells) },
    memory: {
      resultBytesMax: Math.max(...bytes), rssGrowthBytes: rssMax, arrayBufferGrowthBytes: abMax,
      liveExtraBytesMax: gc ? liveMax : null,
      note: 'resultBytes: arrays returned by one cut (positions, indices, provenance, fields). liveExtraBytes (node --expose-gc only): '
        + 'array memory held after a cut and a full GC, beyond the dataset and the tree — the last result plus the module scratch buffers. '
        + 'Growth figures include the tree and uncollected garbage.',
    },
  };
}

/**
 * The cut benchmark on the worker pool: the same planes, each worker cutting its share of the cells and the
 * merged cut integrated on this thread (ComputePool.integratePlane). The first cut scans the cells; the first
 * tree cut includes every worker building the cell tree of its share (`treeBuildAndCutMs`), there being no
 * separate build step on the pool.
 */
export async function benchPoolCuts(pool: ComputePool): Promise<Record<string, unknown>> {
  const d = pool.dataset, planes = benchPlanes(d);
  datasetScale(d);
  let t = performance.now();
  const c0 = process.cpuUsage();
  const first = await pool.integratePlane({ ...planes[0]!, cut: { candidates: 'scan' } });
  const firstMs = performance.now() - t, cpu = process.cpuUsage(c0);
  const firstCut = {
    ms: r2(firstMs), cpuMs: r2((cpu.user + cpu.system) / 1000), cutOnlyMs: r2(first.cut.stats.ms), source: 'scan',
    triangles: first.cut.indices.length / 3, candidates: first.cut.stats.candidateCells, workers: pool.size,
  };
  t = performance.now();
  await pool.integratePlane({ ...planes[0]!, cut: { candidates: 'tree' } });
  const treeMs = performance.now() - t;
  const cutMs: number[] = [], totalMs: number[] = [], tris: number[] = [], cells: number[] = [];
  for (let pass = 0; pass < 2; pass++) {
    for (const p of planes) {
      t = performance.now();
      const r = await pool.integratePlane({ ...p, cut: { candidates: 'tree' } });
      const ms = performance.now() - t;
      if (pass === 0) continue; // warm-up pass, as on one thread
      totalMs.push(ms); cutMs.push(r.cut.stats.ms);
      tris.push(r.cut.indices.length / 3); cells.push(r.cut.stats.cutCells);
    }
  }
  return {
    planes: planes.length, workers: pool.size,
    fields: first.cut.fields.map((f) => `${f.name} (${f.association})`), firstCut,
    treeBuildAndCutMs: r2(treeMs),
    laterCuts: { cutAndIntegralsMs: stats(totalMs), cutOnlyMs: stats(cutMs), source: 'tree', triangles: stats(tris), cellsCut: stats(cells) },
  };
}

const stage: BenchStage = {
  name: 'cut',
  order: 30,
  run: (d) => benchCuts(d),
  runOnPool: (pool) => benchPoolCuts(pool),
};
export default stage;
