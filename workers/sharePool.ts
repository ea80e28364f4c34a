/**
 * The pool in the browser: the compute worker starts share workers (workers/share.worker.ts) and hands
 * them the dataset in shared memory (src/parallel/). Used only when the page is cross-origin isolated and
 * the plan (src/parallel/poolPlan.ts) asks for more than one worker.
 */
import type { Dataset } from '../src/model/dataset.ts';
import { ComputePool, type PoolPort } from '../src/parallel/pool.ts';
import type { ShareReply } from '../src/parallel/shareHost.ts';
import { toSharedDataset } from '../src/parallel/sharedDataset.ts';

function browserPort(i: number): PoolPort {
  const w = new Worker(new URL('./share.worker.ts', import.meta.url), { type: 'module', name: `fieldtally-share-${i + 1}` });
  const handlers: ((r: ShareReply) => void)[] = [];
  w.addEventListener('message', (e: MessageEvent<ShareReply>) => { for (const h of handlers) h(e.data); });
  w.addEventListener('error', (e) => { for (const h of handlers) h({ id: -1, ok: false, error: `worker pool: a share worker failed (${e.message})` }); });
  return {
    postMessage: (m) => w.postMessage(m),
    onMessage: (h) => { handlers.push(h); },
    terminate: () => w.terminate(),
  };
}

/** Copies the dataset into shared memory and opens `n` share workers over it. */
export async function openBrowserPool(dataset: Dataset, n: number): Promise<ComputePool> {
  const ports = Array.from({ length: n }, (_, i) => browserPort(i));
  try {
    return await ComputePool.open(toSharedDataset(dataset), ports);
  } catch (e) {
    for (const p of ports) void p.terminate();
    throw e;
  }
}
