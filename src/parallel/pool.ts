/**
 * A pool of compute workers over one dataset: each worker owns a contiguous share of the cells
 * (`shares.ts`) of the dataset held in shared memory (`sharedDataset.ts`), runs the single-thread kernels on
 * it, and the pool merges the partial results (`mergeParts.ts`) into exactly what the single-thread core
 * gives on the whole dataset (to rounding; in practice bit for bit, as every merge keeps the single-thread order).
 *
 * What runs where:
 *  - cut: each worker cuts its share (its own cell tree over its cells); the merged cut is selected (region
 *    filters, seeds) and integrated once here by `selectRegion` and `integrateSurface`;
 *  - line (evenly spaced samples): each worker locates every sample in its cells; the merge applies the
 *    tie rule. Face-crossing lines run on the whole dataset here (their crossing list spans shares);
 *  - boundary faces: each worker extracts its share's; the merge cancels faces between shares. The result
 *    primes the dataset's surface cache, so groups, force totals and probe sets use it.
 * Platform-neutral: `spawn` gives a port per worker (Node: `nodePool.ts`; browser: the app's compute worker).
 */
import type { CutOptions } from '../cut/cutPlane.ts';
import { integrateSurface } from '../cut/integrals.ts';
import type { PlaneQuery, PlaneResult } from '../cut/planeIntegrals.ts';
import { selectRegion } from '../cut/region.ts';
import { warmUpCutKernels } from '../cut/warmUp.ts';
import type { Vec3 } from '../cut/triangleSet.ts';
import { totalCells, type Dataset } from '../model/dataset.ts';
import { findField } from '../model/piece.ts';
import { probeLine, type LineProbeOptions, type LineProbeResult } from '../locate/lineProbe.ts';
import type { BoundaryFaces } from '../surface/boundaryFaces.ts';
import { primeBoundaryFaces } from '../surface/surfaceCache.ts';
import { warmUpSurfaceKernels } from '../surface/warmUp.ts';
import type { EvaluateOptions, SetEvaluation } from '../study/evaluate.ts';
import type { ProbeSet } from '../study/probeSet.ts';
import { mergeBoundary, mergeLines } from './mergeParts.ts';
import { cutInPlace, summedBlocks } from './placeCuts.ts';
import { dealProbes, joinEvaluations, subSet } from './probeSetShares.ts';
import { nodeRanges } from '../derive/rangeGradient.ts';
import type { DerivedName } from '../derive/derivedFields.ts';
import type { SharedKernelMeshRef } from '../derive/sharedKernelMesh.ts';
import type { ShareMessage, ShareReply, ShareRequest, WorkerMemory } from './shareHost.ts';
import type { BoundaryPart, LinePart } from './shareTasks.ts';
import { toSharedDataset } from './sharedDataset.ts';
import { splitCells, type CellShare } from './shares.ts';

const EMPTY = new Float64Array(0);

/** The pool's end of one worker. */
export interface PoolPort {
  postMessage(message: ShareMessage): void;
  onMessage(handler: (reply: ShareReply) => void): void;
  /** Ends the worker. */
  terminate(): void | Promise<unknown>;
}

/** Largest pool size accepted from an option or the environment. */
export const MAX_WORKERS = 256;

/**
 * Checks a requested worker count (from `--workers`, `FIELDTALLY_WORKERS`, or a setting): a whole number
 * 1 … 256. `where` names the source for the message.
 */
export function checkWorkerCount(n: unknown, where: string): number {
  const v = typeof n === 'string' && /^\s*\d+\s*$/.test(n) ? Number(n) : n;
  if (typeof v !== 'number' || !Number.isInteger(v) || v < 1 || v > MAX_WORKERS) {
    throw new Error(`${where}: expected a whole number of workers from 1 to ${MAX_WORKERS}, got "${String(n)}"`);
  }
  return v;
}

/** One worker and its pending requests. */
class Lane {
  private next = 1;
  private readonly waiting = new Map<number, { resolve: (v: unknown) => void; reject: (e: Error) => void }>();
  constructor(readonly port: PoolPort) {
    port.onMessage((r) => {
      // id −1: the worker itself failed; every pending request fails with its message.
      if (r.id === -1 && !r.ok) { this.fail(r.error); return; }
      const w = this.waiting.get(r.id);
      if (!w) return;
      this.waiting.delete(r.id);
      if (r.ok) w.resolve(r.result); else w.reject(new Error(r.error));
    });
  }
  call<T>(req: ShareRequest): Promise<T> {
    const id = this.next++;
    return new Promise<T>((resolve, reject) => {
      this.waiting.set(id, { resolve: resolve as (v: unknown) => void, reject });
      this.port.postMessage({ ...req, id });
    });
  }
  /** Rejects everything pending (the worker died or the pool closed). */
  fail(message: string): void {
    for (const w of this.waiting.values()) w.reject(new Error(message));
    this.waiting.clear();
  }
}

/** A pool of compute workers holding one dataset. Create with `ComputePool.open`. */
export class ComputePool {
  private boundaryFaces: Promise<BoundaryFaces> | undefined;
  /**
   * Whether `integratePlane` has the workers sum the integral's blocks that lie in their own triangles as they
   * place them (same bits as summing them all here; see `cutInPlace`). Default true: it takes most of the
   * integral off this thread, which otherwise sums every triangle after the workers are done (1M hexahedra,
   * later cut of 45 216 triangles: this thread's CPU 17–19 → 7–8 ms, each worker's +5–6 ms; DEVELOPERS.md,
   * "The worker pool"). It was off while the workers' first-transfer deoptimisations made it cost more (gone
   * since: share workers transfer nothing, shareHost.ts).
   */
  sumInWorkers = true;
  private constructor(readonly dataset: Dataset, readonly shares: readonly CellShare[], private readonly lanes: Lane[]) {}

  /**
   * Starts holding `dataset` (already in shared memory for more than one worker) on the given workers: one
   * share per port; ports beyond the cell count are ended unused.
   */
  static async open(dataset: Dataset, ports: readonly PoolPort[]): Promise<ComputePool> {
    if (ports.length === 0) throw new Error('worker pool: no workers');
    const shares = splitCells(totalCells(dataset), ports.length);
    for (const p of ports.slice(shares.length)) await p.terminate();
    const lanes = ports.slice(0, shares.length).map((p) => new Lane(p));
    const pool = new ComputePool(dataset, shares, lanes);
    // This thread selects and integrates every merged cut and sums force totals over the merged boundary: its kernels
    // warm up (the surface ones on datasets of the shared shape it will hold) while the workers take on their shares.
    await Promise.all([...lanes.map((l, i) => l.call({ op: 'hold', dataset, share: shares[i]! })), warmUpCutKernels(), warmUpSurfaceKernels(toSharedDataset)]);
    return pool;
  }

  /** Number of workers. */
  get size(): number { return this.lanes.length; }

  private all<T>(req: (i: number) => ShareRequest): Promise<T[]> {
    return Promise.all(this.lanes.map((l, i) => l.call<T>(req(i))));
  }

  /** The cut, as `cutPlane` gives it on the whole dataset (units: the file's). */
  async cutPlane(origin: Vec3, normal: Vec3, options: Partial<CutOptions> = {}) {
    if (!origin.every(Number.isFinite)) throw new Error(`cutPlane: origin must be three finite numbers, got (${origin.join(', ')})`);
    return cutInPlace((req) => this.all(req), origin, normal, options);
  }

  /** Cuts, selects the region and integrates: `integratePlane` (planeIntegrals.ts) with the cut done by the workers. */
  async integratePlane(q: PlaneQuery): Promise<PlaneResult> {
    if (!q.origin.every(Number.isFinite)) throw new Error(`cutPlane: origin must be three finite numbers, got (${q.origin.join(', ')})`);
    // Over the whole cut, the workers may sum most blocks of the integral as they place their triangles.
    const whole = this.sumInWorkers && (q.region ?? []).length === 0;
    const cut = await cutInPlace((req) => this.all(req), q.origin, q.normal, q.cut ?? {}, whole ? q.integral ?? {} : undefined);
    const region = selectRegion(cut, q.region ?? []);
    const integrals = integrateSurface(region.set, q.integral, region.arcs ?? undefined, region.set === cut ? summedBlocks(cut) : undefined);
    if (integrals.empty) {
      integrals.reason = cut.empty ? 'the plane misses every 3D cell of the mesh' : region.reason ?? integrals.reason;
    }
    return { cut, region, integrals };
  }

  /**
   * A line probe, as `probeLine` gives it on the whole dataset. Evenly spaced samples are located by the
   * workers; face-crossing lines run here on the whole dataset (building its cell tree on first use).
   */
  async probeLine(from: Vec3, to: Vec3, options: Partial<LineProbeOptions> = {}): Promise<LineProbeResult> {
    if ((options.mode ?? 'samples') !== 'samples') return probeLine(this.dataset, from, to, options);
    // The request is checked here, with probeLine's own messages, before any worker starts.
    validateLine(from, to, options);
    const samples = options.samples ?? 101;
    const parts = await this.all<LinePart>(() => ({
      op: 'line', from, to,
      options: { samples, ...(options.fields ? { fields: options.fields } : {}), ...(options.tolerance !== undefined ? { tolerance: options.tolerance } : {}) },
    }));
    if (parts.every((p) => p.volumeCells === 0)) {
      throw new Error(`locate: "${this.dataset.source}" holds no volume cells (${totalCells(this.dataset)} surface/line/vertex cells); point location is defined only inside 3D cells`);
    }
    return mergeLines(parts, from, to, samples);
  }

  /** The boundary faces of the whole dataset (default options), extracted by the workers once and cached with the dataset. */
  boundary(): Promise<BoundaryFaces> {
    this.boundaryFaces ??= this.all<BoundaryPart>((i) => ({ op: 'boundary', withMerge: i === 0 })).then((parts) => {
      const b = mergeBoundary(this.dataset, parts);
      primeBoundaryFaces(this.dataset, b);
      return b;
    });
    return this.boundaryFaces;
  }

  /**
   * Every probe of a (checked) set, as `evaluateProbeSet` gives it on the whole dataset: the probes are dealt
   * out to the workers (`probeSetShares.ts`), each evaluating whole probes on the whole shared dataset.
   */
  async evaluateProbeSet(set: ProbeSet, options: Partial<EvaluateOptions> = {}): Promise<SetEvaluation> {
    const lane = dealProbes(set.probes, this.lanes.length);
    const parts = await Promise.all(this.lanes.map((l, w) => {
      const sub = subSet(set, lane, w);
      return sub ? l.call<SetEvaluation>({ op: 'evaluate', set: sub, options }) : Promise.resolve(null);
    }));
    return joinEvaluations(set, lane, parts);
  }

  /**
   * The quadratic least-squares gradient of point field `field` of piece `piece` (`fieldGradient`'s layout and
   * values, bit for bit): the piece's nodes split into one contiguous range per worker, each worker filling its
   * range of one shared array (src/parallel/deriveShares.ts). `kernelMesh`: the id of a shared kernel mesh every
   * worker has attached (`attachKernelMesh`) and that holds this field's values, to fit there.
   */
  async pointGradient(piece: number, field: string, kernelMesh?: number): Promise<Float64Array> {
    const p = this.dataset.pieces[piece], f = p && findField(p, field, 'point');
    if (!p || !f) throw new Error(`gradient: no point field "${field}" on piece ${piece} of ${this.dataset.source}`);
    const np = p.points.length / 3, bytes = 8 * 3 * f.components * np;
    const out = typeof SharedArrayBuffer === 'undefined' ? new Float64Array(bytes / 8) : new Float64Array(new SharedArrayBuffer(bytes));
    const bounds = nodeRanges(np, this.lanes.length), w = 3 * f.components;
    const parts = await Promise.all(this.lanes.slice(0, bounds.length - 1).map((l, i) =>
      l.call<Float64Array | null>({ op: 'gradient', piece, field, from: bounds[i]!, to: bounds[i + 1]!, out, kernelMesh })));
    // without shared memory each worker sends its range back
    parts.forEach((part, i) => { if (part) out.set(part, w * bounds[i]!); });
    return out;
  }

  /**
   * Quantities of the velocity gradient of point field `field` of piece `piece` (`names`: NODE_QUANTITIES of
   * src/derive/derivedFields.ts, with their components), each as `withDerivedFields` makes it, bit for bit: the
   * nodes split as for `pointGradient`, each worker writing its range of every quantity into shared arrays; the
   * gradient itself stays in the workers. `kernelMesh` as for `pointGradient`.
   */
  async pointDerived(piece: number, field: string, names: readonly { name: DerivedName; components: number }[], kernelMesh?: number): Promise<Float64Array[]> {
    const p = this.dataset.pieces[piece], f = p && findField(p, field, 'point');
    if (!p || !f) throw new Error(`gradient: no point field "${field}" on piece ${piece} of ${this.dataset.source}`);
    const np = p.points.length / 3, shared = typeof SharedArrayBuffer !== 'undefined';
    const outs = names.map((q) => (shared ? new Float64Array(new SharedArrayBuffer(8 * q.components * np)) : new Float64Array(q.components * np)));
    const bounds = nodeRanges(np, this.lanes.length);
    const parts = await Promise.all(this.lanes.slice(0, bounds.length - 1).map((l, i) => l.call<Float64Array[] | null>({
      op: 'gradient', piece, field, from: bounds[i]!, to: bounds[i + 1]!, out: EMPTY, quantities: names.map((q, k) => ({ name: q.name, out: outs[k]! })), kernelMesh,
    })));
    parts.forEach((part, i) => part?.forEach((v, k) => outs[k]!.set(v, names[k]!.components * bounds[i]!)));
    return outs;
  }

  /**
   * The quadratic least-squares gradient of point field `field` of piece `piece` at the chosen `nodes` only
   * (`pointGradientAt`'s layout and values, bit for bit): the list split into one contiguous run per worker, each
   * fitting its run with `pointGradientAt` (fieldGradient.ts) into one shared array (src/parallel/deriveShares.ts).
   */
  async pointGradientAt(piece: number, field: string, nodes: Int32Array): Promise<Float64Array> {
    const p = this.dataset.pieces[piece], f = p && findField(p, field, 'point');
    if (!p || !f) throw new Error(`gradient: no point field "${field}" on piece ${piece} of ${this.dataset.source}`);
    const n = nodes.length, bytes = 8 * 3 * f.components * n;
    const out = typeof SharedArrayBuffer === 'undefined' ? new Float64Array(bytes / 8) : new Float64Array(new SharedArrayBuffer(bytes));
    const bounds = nodeRanges(n, this.lanes.length), w = 3 * f.components;
    const parts = await Promise.all(this.lanes.slice(0, bounds.length - 1).map((l, i) =>
      l.call<Float64Array | null>({ op: 'gradient', piece, field, from: bounds[i]!, to: bounds[i + 1]!, out, nodes: nodes.slice(bounds[i]!, bounds[i + 1]!) })));
    parts.forEach((part, i) => { if (part) out.set(part, w * bounds[i]!); });
    return out;
  }

  /**
   * Hands every worker its area of a shared kernel mesh (src/derive/sharedKernelMesh.ts); `pointGradient` and
   * `pointDerived` given its id then fit there. With `copy`, each worker first copies one node range of that
   * piece's positions and of its point field `copy.field` into the mesh (`copySharedNodes`; the ranges as
   * `pointGradient` splits the nodes). Resolves true when every worker took it.
   */
  async attachKernelMesh(mesh: SharedKernelMeshRef, copy?: { piece: number; field: string }): Promise<boolean> {
    if (mesh.areas.length < this.lanes.length) throw new Error(`worker pool: a shared kernel mesh of ${mesh.areas.length} areas for ${this.lanes.length} workers`);
    const bounds = nodeRanges(mesh.nodes, this.lanes.length);
    return (await this.all<boolean>((i) => ({
      op: 'kernelMesh', mesh, area: mesh.areas[i]!,
      copy: copy && i + 1 < bounds.length ? { ...copy, from: bounds[i]!, to: bounds[i + 1]! } : undefined,
    }))).every(Boolean);
  }
  /** Memory each worker reports (bytes; null where the platform cannot tell). The shared dataset is not in it. */
  memory(): Promise<(WorkerMemory | null)[]> {
    return this.all<WorkerMemory | null>(() => ({ op: 'memory' }));
  }

  /** Ends every worker. */
  async close(): Promise<void> {
    for (const l of this.lanes) l.fail('worker pool: closed');
    await Promise.all(this.lanes.map((l) => l.port.terminate()));
  }
}

/** The checks `probeLine` makes before any work, with its messages (evenly spaced samples). */
function validateLine(from: Vec3, to: Vec3, o: Partial<LineProbeOptions>): void {
  if (![...from, ...to].every(Number.isFinite)) throw new Error(`line probe: end points must be finite, got ${from.join(',')} → ${to.join(',')}`);
  if (!(Math.hypot(to[0] - from[0], to[1] - from[1], to[2] - from[2]) > 0)) throw new Error(`line probe: the two end points coincide (${from.join(',')})`);
  const n = o.samples ?? 101;
  if (!(Number.isInteger(n) && n >= 2 && n <= 1e7)) throw new Error(`line probe: samples must be an integer from 2 to 10000000, got ${n}`);
}
