/**
 * Parallel decoding of zlib-compressed arrays under Node (Node only, like nodePool.ts): a few worker threads
 * (workers/inflateWorker.node.mjs) inflate a batch of blocks at once. The reader hands over a batch of whole
 * blocks (`InflateBlock.batch`, src/io/xmlAppended.ts); the batch's compressed bytes are copied into a shared
 * buffer, each worker inflates a contiguous run of blocks (balanced by compressed size) into a shared output
 * buffer, and the decoded bytes are copied into the final array — or, when the final array is itself in shared
 * memory (`LoadOptions.sharedArrays`), straight into it. zlib is deterministic, so the arrays are the same bytes
 * as a one-thread load (tested).
 */
import { Worker } from 'node:worker_threads';
import type { InflateBlock } from '../io/loadOptions.ts';
import { nodeInflate } from '../io/nodeFiles.ts';
import { checkWorkerCount } from './pool.ts';
import { workerEntry } from './workerEntry.ts';

/** An inflater whose `batch` runs on worker threads; `close` ends them. */
export interface InflatePool {
  readonly inflate: InflateBlock;
  readonly workers: number;
  /** Batches and blocks inflated by the workers so far; `inPlace`: of those blocks, the ones written straight into their shared final array. */
  readonly done: { batches: number; blocks: number; inPlace: number };
  /** Resolves when every worker has started and answered an empty batch. */
  ready(): Promise<void>;
  close(): Promise<void>;
}

/** Starts `n` inflate workers (1 … 256). */
export function startInflatePool(n: number): InflatePool {
  checkWorkerCount(n, 'inflate workers');
  const workers = Array.from({ length: n }, () => new Worker(workerEntry('inflate')));
  const waiting = new Map<number, { resolve: (g: (number | string)[]) => void; reject: (e: Error) => void }>();
  let next = 1;
  for (const w of workers) {
    w.on('message', (m: { id: number; got: (number | string)[] }) => { const p = waiting.get(m.id); waiting.delete(m.id); p?.resolve(m.got); });
    w.on('error', (e) => { for (const p of waiting.values()) p.reject(new Error(`inflate worker failed (${e.message})`)); waiting.clear(); });
  }
  let input = new SharedArrayBuffer(1 << 20), output = new SharedArrayBuffer(1 << 20);
  const done = { batches: 0, blocks: 0, inPlace: 0 };

  const batch = async (blocks: readonly Uint8Array[], outs: readonly Uint8Array[]): Promise<(number | string)[]> => {
    // Blocks whose places all lie in one shared buffer (a final array decoded into shared memory) are inflated
    // straight into it by the workers: no copy of the decoded bytes on this thread, and the first writes of
    // fresh memory are spread over the workers. Others go through the pool's output buffer and are copied.
    const target = outs.length > 0 && outs[0]!.buffer instanceof SharedArrayBuffer && outs.every((o) => o.buffer === outs[0]!.buffer)
      ? outs[0]!.buffer as SharedArrayBuffer : undefined;
    let inBytes = 0, outBytes = 0;
    for (let i = 0; i < blocks.length; i++) { inBytes += blocks[i]!.length; outBytes += outs[i]!.length; }
    if (input.byteLength < inBytes) input = new SharedArrayBuffer(Math.max(inBytes, 2 * input.byteLength));
    if (!target && output.byteLength < outBytes) output = new SharedArrayBuffer(Math.max(outBytes, 2 * output.byteLength));
    const inView = new Uint8Array(input);
    const jobs = new Float64Array(4 * blocks.length);
    for (let i = 0, a = 0, b = 0; i < blocks.length; i++) {
      inView.set(blocks[i]!, a);
      jobs[4 * i] = a; jobs[4 * i + 1] = blocks[i]!.length; jobs[4 * i + 2] = target ? outs[i]!.byteOffset : b; jobs[4 * i + 3] = outs[i]!.length;
      a += blocks[i]!.length; b += outs[i]!.length;
    }
    // Contiguous runs of blocks, about equal in compressed bytes, one per worker.
    const runs: [number, number][] = [];
    const per = inBytes / workers.length;
    let start = 0, acc = 0;
    for (let i = 0; i < blocks.length; i++) {
      acc += blocks[i]!.length;
      if (acc >= per * (runs.length + 1) && runs.length < workers.length - 1) { runs.push([start, i + 1]); start = i + 1; }
    }
    if (start < blocks.length) runs.push([start, blocks.length]);
    const parts = await Promise.all(runs.map(([a, b], r) => new Promise<(number | string)[]>((resolve, reject) => {
      const id = next++;
      waiting.set(id, { resolve, reject });
      workers[r]!.postMessage({ id, input, output: target ?? output, jobs: Array.from(jobs.subarray(4 * a, 4 * b)) });
    })));
    const got = parts.flat();
    done.batches++; done.blocks += blocks.length;
    if (target) { done.inPlace += blocks.length; return got; }
    const outView = new Uint8Array(output);
    for (let i = 0; i < outs.length; i++) {
      const o = jobs[4 * i + 2]!, n = Math.min(outs[i]!.length, typeof got[i] === 'number' ? got[i] as number : 0);
      outs[i]!.set(outView.subarray(o, o + n));
    }
    return got;
  };
  const inflate: InflateBlock = Object.assign((block: Uint8Array, out: Uint8Array) => nodeInflate(block, out), { batch });
  const ready = async (): Promise<void> => {
    await Promise.all(workers.map((w) => new Promise<(number | string)[]>((resolve, reject) => {
      const id = next++;
      waiting.set(id, { resolve, reject });
      w.postMessage({ id, input, output, jobs: [] });
    })));
  };
  return { inflate, workers: n, done, ready, close: async () => { await Promise.all(workers.map((w) => w.terminate())); } };
}
