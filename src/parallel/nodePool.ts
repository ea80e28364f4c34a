/**
 * The worker pool under Node (command line, benches, tests): `worker_threads` workers running
 * workers/shareWorker.node.mjs, sized to the machine. Node only (like src/io/nodeFiles.ts).
 *
 * Size: the `workers` argument, else the `FIELDTALLY_WORKERS` environment variable, else
 * `os.availableParallelism()`; never more workers than cells.
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { Dataset } from '../model/dataset.ts';
import { ComputePool, checkWorkerCount, type PoolPort } from './pool.ts';
import type { ShareReply } from './shareHost.ts';
import { toSharedDataset } from './sharedDataset.ts';
import { workerEntry } from './workerEntry.ts';

/** The pool size to use: `requested` if given, else `FIELDTALLY_WORKERS`, else the machine's parallelism (checked, 1 … 256). */
export function poolSize(requested?: number | string): number {
  if (requested !== undefined) return checkWorkerCount(requested, '--workers');
  const env = process.env.FIELDTALLY_WORKERS;
  if (env !== undefined && env !== '') return checkWorkerCount(env, 'FIELDTALLY_WORKERS');
  return Math.max(1, availableParallelism());
}

function nodePort(): PoolPort {
  const w = new Worker(workerEntry('share'));
  const handlers: ((r: ShareReply) => void)[] = [];
  let failed: string | undefined;
  w.on('message', (r: ShareReply) => { for (const h of handlers) h(r); });
  const fail = (message: string) => {
    failed ??= message;
    // Every pending request of this worker fails with the worker's own error.
    for (const h of handlers) h({ id: -1, ok: false, error: message });
  };
  w.on('error', (e) => fail(`worker pool: a worker failed (${e.message})`));
  w.on('exit', (code) => { if (code !== 0) fail(`worker pool: a worker stopped with exit code ${code}`); });
  return {
    postMessage: (m) => {
      if (failed) { for (const h of handlers) h({ id: m.id, ok: false, error: failed }); return; }
      w.postMessage(m);
    },
    onMessage: (h) => { handlers.push(h); },
    terminate: () => w.terminate(),
  };
}

/**
 * Starts `n` worker threads now (each takes a few hundred ms to load its code, so start them before reading
 * the file they will work on); hand them to `ComputePool.open`, or end them with `terminate`.
 */
export function startNodeWorkers(n: number): PoolPort[] {
  return Array.from({ length: checkWorkerCount(n, 'worker pool') }, nodePort);
}

/**
 * Resolves when each of `ports` (fresh from `startNodeWorkers`) has loaded its code and warmed its kernels: it
 * answers a request only after its warm-up (shareHost.ts), so a `memory` request's answer marks it.
 */
export async function workersWarm(ports: readonly PoolPort[]): Promise<void> {
  await Promise.all(ports.map((p) => new Promise<void>((resolve, reject) => {
    // An id no pool lane uses (lanes count up from 1), answered before any lane is made.
    const id = -2;
    p.onMessage((r) => {
      if (r.id === id) resolve();
      else if (r.id === -1 && !r.ok) reject(new Error(r.error));
    });
    p.postMessage({ id, op: 'memory' });
  })));
}

/**
 * Copies `dataset` into shared memory and opens a pool of `poolSize(workers)` worker threads over it.
 * Close it with `pool.close()` (the process cannot exit while workers run).
 */
export async function openNodePool(dataset: Dataset, workers?: number | string, ports?: PoolPort[]): Promise<ComputePool> {
  const p = ports ?? startNodeWorkers(poolSize(workers));
  try {
    return await ComputePool.open(toSharedDataset(dataset), p);
  } catch (e) {
    await Promise.all(p.map((x) => x.terminate()));
    throw e;
  }
}
