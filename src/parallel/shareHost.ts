/**
 * The compute worker's side of the pool: holds the (shared) dataset and its share, and answers the pool's
 * messages by running `shareTasks.ts` on the share. Platform-neutral: the Node bootstrap
 * (workers/shareWorker.node.mjs) and the browser entry (workers/share.worker.ts) hand it their port.
 *
 * Messages: `{ id, op, args }` in, `{ id, ok: true, result }` or `{ id, ok: false, error }` out. Results are
 * copied, never transferred: no array buffer is ever detached in a share worker, so the engine keeps compiling
 * its typed-array code without detach checks (the first detach in a thread throws away every optimised function
 * that touched a typed array, and spending it up front slows every access ~15 %; DEVELOPERS.md, "The worker
 * pool"). Large results go through shared memory (the cut, the node quantities); the rest are small. A cut is kept here until the
 * host says where to write it in the merged cut's shared arrays (`placeCuts.ts`).
 */
import { totalCells, type Dataset } from '../model/dataset.ts';
import { boundaryShare, cutShare, lineShare, placeCutShare, sumCutBlocks, type LineShareOptions } from './shareTasks.ts';
import type { CutRequest } from './placeCuts.ts';
import { gradientShare, kernelMeshShare, type GradientShare, type KernelMeshShare } from './deriveShares.ts';
import { shareDataset, type CellShare } from './shares.ts';
import { prepareCut } from '../cut/cutPlane.ts';
import { warmUpCutKernels } from '../cut/warmUp.ts';
import { warmUpShareKernels } from './shareWarmUp.ts';
import { warmUpFitKernels } from '../derive/warmUpFit.ts';
import { warmUpLocateKernels } from '../locate/warmUp.ts';
import type { Vec3 } from '../cut/triangleSet.ts';
import { evaluateProbeSet, type EvaluateOptions } from '../study/evaluate.ts';
import type { ProbeSet } from '../study/probeSet.ts';

/** The operations a share worker answers, with their arguments. */
export type ShareRequest =
  | { op: 'hold'; dataset: Dataset; share: CellShare }
  | CutRequest
  | { op: 'line'; from: Vec3; to: Vec3; options: LineShareOptions }
  | { op: 'boundary'; withMerge: boolean }
  | { op: 'evaluate'; set: ProbeSet; options: Partial<EvaluateOptions> }
  | ({ op: 'gradient' } & GradientShare)
  | ({ op: 'kernelMesh' } & KernelMeshShare)
  | { op: 'memory' };

/** A message to a share worker. */
export type ShareMessage = ShareRequest & { id: number };

/** A reply from a share worker. */
export type ShareReply = { id: number; ok: true; result: unknown } | { id: number; ok: false; error: string };

/** The minimal port both platforms give: post a message (with a transfer list), and receive messages. */
export interface SharePort {
  postMessage(message: ShareReply, transfer: ArrayBuffer[]): void;
  onMessage(handler: (message: ShareMessage) => void): void;
}

/** What a worker reports about its memory (bytes), where the platform can tell: JS heap in use and its own (non-shared) array buffers. */
export interface WorkerMemory {
  heapUsed: number; external: number; arrayBuffers: number;
  /** The worker thread's CPU time so far (ms), where the platform tells it (benchmarks take differences). */
  cpuMs?: number | null;
}

/** A dataset as a worker sees its share: views of every cell (`shareDataset`), the shape its line scans meet. */
const asShareView = (d: Dataset): Dataset => shareDataset(d, { start: 0, end: totalCells(d) });

/**
 * Serves the pool's requests on `port` until the worker ends. `memory` reports this worker's memory when the
 * platform can tell. `warmUp` runs first (default: `warmUpCutKernels`, about 0.1 s, then `warmUpShareKernels` of
 * shareWarmUp.ts, about 0.4 s, then `warmUpFitKernels` of src/derive/warmUpFit.ts, about 0.15 s, then
 * `warmUpLocateKernels` of src/locate/warmUp.ts on share views, about 0.15 s): a pool's workers start while the
 * file is still being read, so their cut kernels, gradient fit and line scan are optimised by the time the first
 * cut, gradient or line arrives instead of running cold over their share (the cold first cut, and the cold wall
 * fit, made two workers slower than one thread).
 * Requests wait for it and are answered one at a time, in order; a failed warm-up only leaves the kernels cold.
 */
export function serveShares(port: SharePort, memory: () => WorkerMemory | null = () => null,
  warmUp: () => Promise<void> = () => warmUpCutKernels().then(() => warmUpShareKernels()).then(warmUpFitKernels)
    .then(() => warmUpLocateKernels(asShareView))): void {
  let whole: Dataset | undefined, share: Dataset | undefined, range: CellShare | undefined;
  const run = (m: ShareRequest): unknown => {
    if (m.op === 'hold') { whole = m.dataset; range = m.share; share = shareDataset(whole, range); prepareCut(share); return null; }
    if (m.op === 'memory') return memory();
    // whole probes on the whole dataset (probeSetShares.ts): the single-thread path, bit for bit
    if (m.op === 'evaluate') { if (!whole) throw new Error('worker pool: no dataset is held by this worker'); return evaluateProbeSet(whole, m.set, m.options); }
    // the pool's one copy of a mesh for the moment kernel (src/derive/sharedKernelMesh.ts), this worker's area in it
    if (m.op === 'kernelMesh') return kernelMeshShare(whole, m);
    if (m.op === 'gradient') { if (!whole) throw new Error('worker pool: no dataset is held by this worker'); return gradientShare(whole, m); }
    if (!share || !range) throw new Error('worker pool: no dataset is held by this worker');
    if (m.op === 'cut') return cutShare(share, m.key, m.origin, m.normal, m.options);
    if (m.op === 'place') return placeCutShare(m.key, range, m.runs, m.into);
    if (m.op === 'sum') return sumCutBlocks(m.into, m.fields, m.sums, m.b0, m.b1);
    if (m.op === 'line') return lineShare(share, range, m.from, m.to, m.options);
    return boundaryShare(share, range, m.withMerge);
  };
  const answer = (m: ShareMessage): void => {
    let reply: ShareReply;
    try {
      reply = { id: m.id, ok: true, result: run(m) };
    } catch (e) {
      reply = { id: m.id, ok: false, error: e instanceof Error ? e.message : String(e) };
    }
    // copied, not transferred: see the file comment
    port.postMessage(reply, []);
  };
  let queue: Promise<void> = warmUp().catch(() => undefined);
  port.onMessage((m) => { queue = queue.then(() => answer(m)); });
}
