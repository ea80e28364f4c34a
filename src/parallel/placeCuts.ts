/**
 * The pool's cut, merged in place: every share worker cuts its cells and reports only counts (`cutShare`);
 * the host works out where each share's triangles go in the merged cut (`planCutRuns`) and makes the merged
 * arrays in shared memory; every worker then writes its runs straight into their places (`placeCutShare`),
 * all at once. Nothing is sent back and nothing is copied a second time on the host.
 *
 * The order is the single-thread cut's: cell triangles of every share in share order (candidate cells
 * ascending), then the in-plane faces added from the cell above, in share order. An in-plane face that one
 * share added from the cell above while another cut it from the cell below (it claimed it) is interior — the
 * two cells sit across the share border — and its triangles are dropped. Each run keeps its vertices in the
 * order they were written, so vertex numbers are the single-thread cut's too.
 */
import type { CutOptions, PlaneCut } from '../cut/cutPlane.ts';
import { SUM_BLOCK, sumLayout, type IntegralOptions, type SummedBlocks } from '../cut/integrals.ts';
import { unitVector, type SurfaceField, type Vec3 } from '../cut/triangleSet.ts';
import type { CutCounts, ShareSums, SharedCutArrays } from './shareTasks.ts';

/** Where each share's runs go: 6 numbers a run (see `placeCutShare`), and the merged totals. */
export interface CutPlan {
  runs: Int32Array[];
  vertices: number;
  triangles: number;
  /** In-plane faces kept (added once) and dropped (interior across a share border). */
  kept: number;
  dropped: number;
}

/** Places the shares' runs (see the file comment) from their counts, in share order. */
export function planCutRuns(parts: readonly CutCounts[]): CutPlan {
  const claimedBy = new Map<string, number>();
  parts.forEach((c, p) => { for (const k of c.planeFaces.claimed) if (!claimedBy.has(k)) claimedBy.set(k, p); });
  const runs: number[][] = parts.map(() => []);
  let t = 0, v = 0, kept = 0, dropped = 0;
  parts.forEach((c, p) => {
    const pf = c.planeFaces, nt = pf.emitted.length ? pf.triStart[0]! : c.triangles, nv = pf.emitted.length ? pf.vertStart[0]! : c.vertices;
    if (nt > 0) runs[p]!.push(0, nt, 0, nv, t, v);
    t += nt; v += nv;
  });
  parts.forEach((c, p) => {
    const pf = c.planeFaces;
    for (let i = 0; i < pf.emitted.length; i++) {
      const owner = claimedBy.get(pf.emitted[i]!);
      if (owner !== undefined && owner !== p) { dropped++; continue; }
      kept++;
      const t0 = pf.triStart[i]!, t1 = pf.triStart[i + 1]!, v0 = pf.vertStart[i]!, v1 = pf.vertStart[i + 1]!;
      if (t1 === t0) continue;
      runs[p]!.push(t0, t1, v0, v1, t, v);
      t += t1 - t0; v += v1 - v0;
    }
  });
  return { runs: runs.map((r) => Int32Array.from(r)), vertices: v, triangles: t, kept, dropped };
}

/** A typed array of `n` elements in a fresh SharedArrayBuffer. */
function shared<T>(ctor: { new (b: SharedArrayBuffer): T; BYTES_PER_ELEMENT: number }, n: number): T {
  return new ctor(new SharedArrayBuffer(n * ctor.BYTES_PER_ELEMENT));
}

/** The requests the pool sends its workers for one cut, `key` naming it between the two steps. */
export type CutRequest =
  | { op: 'cut'; key: number; origin: Vec3; normal: Vec3; options: Partial<CutOptions> }
  | { op: 'place'; key: number; runs: Int32Array; into: SharedCutArrays | null }
  | { op: 'sum'; into: SharedCutArrays; fields: CutCounts['fields']; sums: ShareSums; b0: number; b1: number };

/** First block of worker `w`'s part when `nb` blocks are split evenly between `workers` (contiguous, in order; `w` = `workers` gives `nb`). */
export function blockSplit(nb: number, workers: number, w: number): number {
  return Math.floor((nb * w) / workers);
}

let nextKey = 1;

/** The blocks of a merged cut's integral sums that the workers summed (see `cutInPlace`), by cut. */
const summedBy = new WeakMap<PlaneCut, SummedBlocks>();

/**
 * The integral sums' blocks (`integrals.ts` `blockSums`) the pool's workers summed over `cut` (made by
 * `cutInPlace` with integral options), for `integrateSurface` over the whole cut with those options; undefined
 * when none were.
 */
export function summedBlocks(cut: PlaneCut): SummedBlocks | undefined { return summedBy.get(cut); }

/**
 * The cut on every share, merged in place (see the file comment): `all` sends one request to every worker (by
 * index) and resolves with their replies in worker order. The result is `cutPlane`'s on the whole dataset,
 * its arrays in shared memory. With `integral` (the options the whole cut will be integrated with), once every
 * share is placed the blocks of the integral's triangle pass are split evenly between the workers, each summing
 * its run of blocks from the merged arrays (op `sum`, `summedBlocks`): whichever share a block's triangles came
 * from, so a worker whose share was cut sooner takes half of the summing, not only its own triangles'. Every
 * block is summed by `blockSums` over the same triangles in the same order, so `integrateSurface` folds the
 * one-thread sums bit for bit.
 */
export async function cutInPlace(all: <R>(req: (i: number) => CutRequest) => Promise<R[]>, origin: Vec3, normal: Vec3,
  options: Partial<CutOptions>, integral?: Partial<IntegralOptions>): Promise<PlaneCut> {
  const t0 = performance.now(), key = nextKey++;
  let parts: CutCounts[];
  try {
    parts = await all<CutCounts>(() => ({ op: 'cut', key, origin, normal, options }));
  } catch (e) {
    // the workers whose cut went through let theirs go
    await all<null>(() => ({ op: 'place', key, runs: new Int32Array(0), into: null })).catch(() => undefined);
    throw e;
  }
  const plan = planCutRuns(parts);
  const nV = plan.vertices, nT = plan.triangles;
  const layout = parts[0]?.fields ?? [];
  const into: SharedCutArrays = {
    positions: shared(Float64Array, 3 * nV), indices: shared(Uint32Array, 3 * nT), sourceCell: shared(Int32Array, nT),
    vertexEdges: shared(Int32Array, 2 * nV), vertexT: shared(Float64Array, nV),
    fields: layout.map((f) => shared(Float64Array, (f.association === 'point' ? nV : nT) * f.components)),
  };
  await all<null>((i) => ({ op: 'place', key, runs: plan.runs[i]!, into }));
  const sums = integral && nT > 0 ? shareSums(layout, integral, nT) : null;
  if (sums) {
    const nb = sums.done.length, W = parts.length;
    await all<null>((i) => ({ op: 'sum', into, fields: layout, sums, b0: blockSplit(nb, W, i), b1: blockSplit(nb, W, i + 1) }));
  }
  const fields: SurfaceField[] = layout.map((f, j) => ({ name: f.name, association: f.association, components: f.components, values: into.fields[j]! }));
  const sum = (g: (c: CutCounts) => number) => parts.reduce((s, c) => s + g(c), 0);
  const cut: PlaneCut = {
    positions: into.positions, indices: into.indices, sourceCell: into.sourceCell, vertexEdges: into.vertexEdges, vertexT: into.vertexT, fields,
    origin: [origin[0], origin[1], origin[2]], normal: unitVector(normal, 'cutPlane: normal'), empty: nT === 0,
    stats: {
      candidateCells: sum((c) => c.candidateCells),
      candidateSource: parts.every((c) => c.candidateSource === 'scan') ? 'scan' : 'tree',
      cutCells: sum((c) => c.cutCells) - plan.dropped, boundaryFaces: plan.kept, openChains: sum((c) => c.openChains),
      tolerance: parts[0]?.tolerance ?? 0, ms: performance.now() - t0,
      shares: parts.map((c) => ({ candidateCells: c.candidateCells, triangles: c.triangles, ms: c.ms })),
    },
  };
  if (sums) summedBy.set(cut, { sums: sums.sums, done: sums.done, tri: { un: sums.un, rho: sums.rho, area: sums.area } });
  return cut;
}

/** Shared room for the integral sums' blocks of a merged cut of `nT` triangles; null when the options do not fit its fields (integrateSurface then says why). */
export function shareSums(layout: CutCounts['fields'], integral: Partial<IntegralOptions>, nT: number): ShareSums | null {
  let K: number;
  try { K = sumLayout(layout, integral).K; } catch { return null; }
  const nb = Math.ceil(nT / SUM_BLOCK);
  return {
    options: integral, total: nT, sums: shared(Float64Array, nb * K), done: shared(Uint8Array, nb),
    un: shared(Float64Array, 3 * nT), rho: shared(Float64Array, 3 * nT), area: shared(Float64Array, nT),
  };
}
