/**
 * The browser's parallel inflater: when the page is cross-origin isolated, the compute worker shares each
 * batch of zlib blocks (`InflateBlock.batch`, src/io/xmlAppended.ts) with a few helper workers
 * (workers/inflate.worker.ts). The batch is split into contiguous runs about equal in compressed bytes; the
 * compute worker inflates the first run straight into its place, each helper one other run from a shared
 * input buffer into a shared output buffer, copied into place when it answers. Every thread runs fflate's
 * inflater, so the bytes, and the per-block results the reader turns into messages, are those of a
 * one-thread load. Helpers start at the first batch and live as long as the compute worker.
 */
import type { InflateBatch, InflateBlock } from '../src/io/loadOptions.ts';
import { fflateInflate } from '../src/io/xmlBlocks.ts';
import { inflateRun, splitRuns } from '../src/parallel/inflateRuns.ts';

/** A run waiting for its helper, and how to inflate it on this thread instead (should the helper fail). */
interface Waiting { resolve: (g: (number | string)[]) => void; here: () => (number | string)[] }
interface Helper { worker: Worker; waiting: Map<number, Waiting>; failed: boolean }

function startHelper(i: number): Helper {
  const worker = new Worker(new URL('./inflate.worker.ts', import.meta.url), { type: 'module', name: `fieldtally-inflate-${i + 1}` });
  const h: Helper = { worker, waiting: new Map(), failed: false };
  worker.addEventListener('message', (e: MessageEvent<{ id: number; got: (number | string)[] }>) => {
    const p = h.waiting.get(e.data.id);
    h.waiting.delete(e.data.id);
    p?.resolve(e.data.got);
  });
  // A helper that fails (its script could not start, say) is not asked again; its runs inflate on this thread.
  worker.addEventListener('error', () => {
    h.failed = true;
    for (const p of h.waiting.values()) p.resolve(p.here());
    h.waiting.clear();
  });
  return h;
}

/**
 * fflate's inflater with a `batch` that uses `helpers` helper workers besides the calling thread; fflate's
 * inflater as it is (no batch) when `helpers` is below 1 or the platform cannot share memory between
 * workers (not cross-origin isolated).
 */
export function helperInflate(helpers: number): InflateBlock {
  const g = globalThis as { crossOriginIsolated?: boolean };
  if (helpers < 1 || g.crossOriginIsolated !== true || typeof SharedArrayBuffer === 'undefined') return fflateInflate;
  let pool: Helper[] | undefined;
  let input = new SharedArrayBuffer(1 << 20), output = new SharedArrayBuffer(1 << 20);
  let next = 1;

  // One batch at a time: the shared buffers are reused (a cancelled load's batch may still be running).
  let last: Promise<unknown> = Promise.resolve();
  const batch: InflateBatch = (blocks, outs) => {
    const run = last.then(() => inflateShared(blocks, outs), () => inflateShared(blocks, outs));
    last = run.catch(() => undefined);
    return run;
  };
  const inflateShared: InflateBatch = async (blocks, outs) => {
    pool ??= Array.from({ length: helpers }, (_, i) => startHelper(i));
    const runs = splitRuns(blocks.map((b) => b.length), helpers + 1);
    // Runs after the first go to the helpers: their blocks are copied into the shared input.
    const first = runs[0]![1];
    let inBytes = 0, outBytes = 0;
    for (let i = first; i < blocks.length; i++) { inBytes += blocks[i]!.length; outBytes += outs[i]!.length; }
    if (input.byteLength < inBytes) input = new SharedArrayBuffer(Math.max(inBytes, 2 * input.byteLength));
    if (output.byteLength < outBytes) output = new SharedArrayBuffer(Math.max(outBytes, 2 * output.byteLength));
    const inView = new Uint8Array(input), outView = new Uint8Array(output);
    const jobs = new Array<number>(4 * blocks.length).fill(0);
    for (let i = first, a = 0, b = 0; i < blocks.length; i++) {
      inView.set(blocks[i]!, a);
      jobs[4 * i] = a; jobs[4 * i + 1] = blocks[i]!.length; jobs[4 * i + 2] = b; jobs[4 * i + 3] = outs[i]!.length;
      a += blocks[i]!.length; b += outs[i]!.length;
    }
    const helped = runs.slice(1).map(([a, b], r) => new Promise<(number | string)[]>((resolve) => {
      const h = pool![r]!, id = next++, part = jobs.slice(4 * a, 4 * b);
      const here = () => inflateRun(inView, outView, part, fflateInflate);
      if (h.failed) { resolve(here()); return; }
      h.waiting.set(id, { resolve, here });
      h.worker.postMessage({ id, input, output, jobs: part });
    }));
    // This thread's run, straight into place, while the helpers work.
    const got: (number | string)[] = [];
    for (let i = 0; i < first; i++) {
      try {
        got.push(fflateInflate(blocks[i]!, outs[i]!));
      } catch (e) {
        got.push(e instanceof Error ? e.message : String(e));
      }
    }
    for (const part of await Promise.all(helped)) got.push(...part);
    for (let i = first; i < blocks.length; i++) {
      const o = jobs[4 * i + 2]!, r = got[i]!, n = Math.min(outs[i]!.length, typeof r === 'number' ? r : 0);
      outs[i]!.set(outView.subarray(o, o + n));
    }
    return got;
  };
  return Object.assign((block: Uint8Array, out: Uint8Array) => fflateInflate(block, out), { batch });
}
