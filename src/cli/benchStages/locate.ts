/**
 * Bench stage `locate`: the cell tree (build time, bytes per cell), line probes of 1000 samples (the first
 * one without a tree unless an earlier stage built it, then later ones on the built tree), a line at every cell crossing,
 * and raw point location (points per second). Lines run corner to corner through the dataset's bounds
 * and between seeded random points inside them; every point and cell field common to all pieces is
 * sampled. Skipped (with a note) for datasets without volume cells.
 */
import { buildCellTree, hasCellTree } from '../../locate/cellTree.ts';
import { probeLine, type LineProbeResult, type Vec3 } from '../../locate/lineProbe.ts';
import { createLocation, locatePoint } from '../../locate/locatePoint.ts';
import { datasetBounds } from '../../model/bounds.ts';
import { cellDimension } from '../../model/cellTypes.ts';
import type { Dataset } from '../../model/dataset.ts';
import type { ComputePool } from '../../parallel/pool.ts';
import type { BenchStage } from './stage.ts';
import { seededRandom as seeded } from '../../model/seededRandom.ts';

const r2 = (v: number) => Math.round(v * 100) / 100;
const stats = (a: number[]) => {
  const s = [...a].sort((x, y) => x - y);
  return { min: r2(s[0] ?? NaN), median: r2(s[Math.floor(s.length / 2)] ?? NaN), max: r2(s[s.length - 1] ?? NaN) };
};


export interface LocateBenchOptions {
  /** Samples per line. Default 1000. */
  samples: number;
  /** Later lines timed. Default 20. */
  lines: number;
  /** Random points located for the rate. Default 100 000. */
  points: number;
}

/** `o.lines` lines between random points of the bounds (`rnd`: the seeded generator; `at`: fractions → point), each timed (ms). */
async function randomLines(rnd: () => number, at: (fx: number, fy: number, fz: number) => Vec3, o: LocateBenchOptions,
  probe: (a: Vec3, c: Vec3) => LineProbeResult | Promise<LineProbeResult>): Promise<{ lineMs: number[]; valid: number; total: number }> {
  const lineMs: number[] = [];
  let valid = 0, total = 0;
  for (let i = 0; i < o.lines; i++) {
    const a = at(rnd(), rnd(), rnd()), c = at(rnd(), rnd(), rnd());
    const t = performance.now();
    const r = await probe(a, c);
    lineMs.push(performance.now() - t);
    valid += r.validCount; total += o.samples;
  }
  return { lineMs, valid, total };
}

/** Runs the locate benchmark on a dataset; the tree is built fresh (not taken from the cache). */
export async function benchLocate(d: Dataset, options: Partial<LocateBenchOptions> = {}): Promise<Record<string, unknown>> {
  const o: LocateBenchOptions = { samples: 1000, lines: 20, points: 100_000, ...options };
  if (!d.pieces.some((p) => p.cellTypes.some((t) => cellDimension(t) === 3))) return { skipped: 'no volume cells: point location is defined only inside 3D cells' };
  const b = datasetBounds(d);
  const at = (fx: number, fy: number, fz: number): Vec3 => [b[0] + fx * (b[1] - b[0]), b[2] + fy * (b[3] - b[2]), b[4] + fz * (b[5] - b[4])];
  // A shallow copy is a new cache key: the first line below has to build its own tree.
  const fresh: Dataset = { ...d };
  // …unless an earlier stage built the tree of this mesh: the cache is keyed by the geometry arrays (meshKey)
  const treeBefore = hasCellTree(fresh);
  let t = performance.now();
  const first = probeLine(fresh, at(0.02, 0.03, 0.01), at(0.97, 0.98, 0.99), { samples: o.samples });
  const firstLineMs = performance.now() - t;

  const tree = buildCellTree(d);
  const rnd = seeded(7);
  const { lineMs, valid, total } = await randomLines(rnd, at, o, (a, c) => probeLine(fresh, a, c, { samples: o.samples }));
  t = performance.now();
  const cross = probeLine(fresh, at(0.02, 0.03, 0.01), at(0.97, 0.98, 0.99), { mode: 'crossings' });
  const crossingsMs = performance.now() - t;

  const loc = createLocation();
  const pts = new Float64Array(3 * o.points);
  for (let i = 0; i < pts.length; i += 3) { const p = at(rnd(), rnd(), rnd()); pts[i] = p[0]; pts[i + 1] = p[1]; pts[i + 2] = p[2]; }
  let found = 0;
  t = performance.now();
  for (let i = 0; i < pts.length; i += 3) if (locatePoint(tree, pts[i]!, pts[i + 1]!, pts[i + 2]!, loc)) found++;
  const locateMs = performance.now() - t;

  return {
    fields: first.fields.map((f) => `${f.name} (${f.association})`),
    tree: {
      buildMs: r2(tree.buildMs), phasesMs: Object.fromEntries(Object.entries(tree.buildPhasesMs).map(([k, v]) => [k, r2(v)])),
      bytes: tree.bytes, bytesPerCell: r2(tree.bytes / Math.max(1, tree.cellCount)), nodes: tree.nodeCount, depth: tree.maxDepth,
      note: 'a second build on the same dataset (the first line below built the first one)',
    },
    firstLine: {
      ms: r2(firstLineMs), samples: o.samples, valid: first.validCount, treeBuiltBefore: treeBefore,
      note: treeBefore ? 'the tree of this mesh was already built by an earlier stage (not included)' : 'no tree yet: samples located by a scan of the cell blocks the line meets (their build included)',
    },
    laterLines: { ms: stats(lineMs), lines: o.lines, samples: o.samples, validFraction: r2(valid / Math.max(1, total)) },
    crossingsLine: { ms: r2(crossingsMs), samples: cross.count },
    pointLocation: { points: o.points, found, ms: r2(locateMs), pointsPerSecond: Math.round(o.points / (locateMs / 1000)) },
  };
}

/**
 * The line figures on the worker pool (`ComputePool.probeLine`: each worker locating every sample in its share,
 * over its share's cell tree — built by an earlier cut stage, else by this first line): the same first line
 * and seeded random lines as `benchLocate`. Tree and raw point-location figures have no pool form and are left out.
 */
export async function benchPoolLocate(pool: ComputePool, options: Partial<LocateBenchOptions> = {}): Promise<Record<string, unknown>> {
  const o: LocateBenchOptions = { samples: 1000, lines: 20, points: 100_000, ...options };
  const d = pool.dataset;
  if (!d.pieces.some((p) => p.cellTypes.some((t) => cellDimension(t) === 3))) return { skipped: 'no volume cells: point location is defined only inside 3D cells' };
  const b = datasetBounds(d);
  const at = (fx: number, fy: number, fz: number): Vec3 => [b[0] + fx * (b[1] - b[0]), b[2] + fy * (b[3] - b[2]), b[4] + fz * (b[5] - b[4])];
  const t = performance.now();
  const first = await pool.probeLine(at(0.02, 0.03, 0.01), at(0.97, 0.98, 0.99), { samples: o.samples });
  const firstLineMs = performance.now() - t;
  const { lineMs, valid, total } = await randomLines(seeded(7), at, o, (a, c) => pool.probeLine(a, c, { samples: o.samples }));
  return {
    fields: first.fields.map((f) => `${f.name} (${f.association})`), workers: pool.size,
    firstLine: { ms: r2(firstLineMs), samples: o.samples, valid: first.validCount, note: 'on the pool: each worker over its share (its share tree, if a cut built it)' },
    laterLines: { ms: stats(lineMs), lines: o.lines, samples: o.samples, validFraction: r2(valid / Math.max(1, total)) },
  };
}

const stage: BenchStage = {
  name: 'locate',
  order: 40,
  run: (d) => benchLocate(d),
  runOnPool: (pool) => benchPoolLocate(pool),
};
export default stage;
