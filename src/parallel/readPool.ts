/**
 * Reading large uncompressed arrays of files on disk on several threads (Node only, like inflatePool.ts): the
 * reader allocates the final array in shared memory (`LoadOptions.readParts`, src/io/sourceArrays.ts), and each
 * worker (workers/readWorkerBody.ts) reads contiguous parts of it from the file by positional reads of the
 * descriptor this process opened, converting, swapping and checking its elements in place (src/io/partReads.ts);
 * an array is cut into a few parts per worker, handed out as workers finish, so a thread the machine holds back
 * (others' work on a shared machine) delays it little.
 *
 * Why: the arrays come out in shared memory, so a compute pool over them (`toSharedDataset`) takes them without
 * a copy (a second write of as many fresh bytes: on the 10M-cell file the peak fell from 2.05× to 1.14× the
 * decoded arrays); and the page faults of first writing each part, its conversion and its scans run on the thread
 * that writes it (10M-cell file, quiet 2-core machine: 1.3–1.5 s on two threads against 2.0–2.3 s on one; no gain
 * when another process holds a core; DEVELOPERS.md, "Loading at scale"). Same code per chunk as the one-thread read, parts start on its chunk boundaries: the
 * values and messages are those of a one-thread load (tests/parallel/readParts.test.ts).
 */
import { Worker } from 'node:worker_threads';
import type { ReadParts } from '../io/loadOptions.ts';
import { joinScans, partRanges } from '../io/partReads.ts';
import type { ArrayScan } from '../model/arrayScans.ts';
import { checkWorkerCount } from './pool.ts';
import { workerEntry } from './workerEntry.ts';

/** Parts per worker and array: small enough that a thread held back by the machine delays the array little. */
const PARTS_PER_WORKER = 4;

/** A worker's answer for one part: the one-thread message of its first bad element, or its scan. */
interface PartReply { id: number; error: string | null; scan: ArrayScan }

/** A `ReadParts` whose parts are read on worker threads; `close` ends them. */
export interface ReadPool {
  readonly readParts: ReadParts;
  readonly workers: number;
  /** Arrays and parts read by the workers so far. */
  readonly done: { arrays: number; parts: number };
  close(): Promise<void>;
}

/**
 * Starts `n` read workers (1 … 256) at once, so they are ready by the first large array. `minBytes` (tests)
 * overrides the size below which arrays are read on the calling thread.
 */
export function startReadPool(n: number, minBytes?: number): ReadPool {
  checkWorkerCount(n, 'read workers');
  const workers = Array.from({ length: n }, () => new Worker(workerEntry('read')));
  const waiting = new Map<number, { resolve: (r: PartReply) => void; reject: (e: Error) => void }>();
  let next = 1;
  for (const w of workers) {
    w.on('message', (m: PartReply) => { const p = waiting.get(m.id); waiting.delete(m.id); p?.resolve(m); });
    w.on('error', (e) => { for (const p of waiting.values()) p.reject(new Error(`read worker failed (${e.message})`)); waiting.clear(); });
  }
  const done = { arrays: 0, parts: 0 };
  const read = async (job: Parameters<ReadParts>[0]): Promise<ArrayScan> => {
    const { out } = job;
    if (!(out.buffer instanceof SharedArrayBuffer)) throw new Error(`${job.plan.where}: read workers need the array in a SharedArrayBuffer`);
    const ranges = partRanges(job.count, job.step, workers.length * PARTS_PER_WORKER);
    const replies: PartReply[] = new Array(ranges.length);
    let nextPart = 0, firstFailed = ranges.length;
    const send = (w: Worker, r: number) => new Promise<PartReply>((resolve, reject) => {
      const id = next++;
      waiting.set(id, { resolve, reject });
      const [from, to] = ranges[r]!;
      w.postMessage({
        id, descriptor: job.descriptor, name: job.name, size: job.size, offset: job.offset, plan: job.plan,
        buffer: out.buffer, byteOffset: out.byteOffset, length: out.length, from, to, step: job.step,
      });
    });
    // Each worker takes the next part when it is done with one, so a thread the machine holds back takes fewer.
    // Parts after one that failed are not started: the lowest part that failed holds the array's first bad
    // element, where the one-thread read stops too.
    const serve = async (w: Worker): Promise<void> => {
      while (nextPart < Math.min(ranges.length, firstFailed)) {
        const r = nextPart++;
        const m = await send(w, r);
        replies[r] = m;
        done.parts++;
        if (m.error !== null && r < firstFailed) firstFailed = r;
      }
    };
    await Promise.all(workers.map(serve));
    done.arrays++;
    if (firstFailed < ranges.length) throw new Error(replies[firstFailed]!.error!);
    return joinScans(replies.map((m) => m.scan));
  };
  const readParts: ReadParts = Object.assign(read, { workers: n, ...(minBytes !== undefined ? { minBytes } : {}) });
  return { readParts, workers: n, done, close: async () => { await Promise.all(workers.map((w) => w.terminate())); } };
}
