/**
 * Reading large uncompressed arrays of files on disk on several threads (Node only, like inflatePool.ts): the
 * reader allocates the final array in shared memory (`LoadOptions.readParts`, src/io/sourceArrays.ts), and each
 * worker (workers/readWorkerBody.ts) reads contiguous parts of it from the file by positional reads of the
 * descriptor this process opened, converting, swapping and checking its elements in place (src/io/partReads.ts);
 * an array is cut into a few parts per worker, handed out as workers finish, so a thread the machine holds back
 * (others' work on a shared machine) delays it little. Until every worker has started (each posts
 * `{ ready: true }`; starting one costs 0.1–0.5 s, about what the first large array takes to read) the loading
 * thread reads parts itself, the same way (`readPartSync` with positional reads), so the first arrays do not
 * wait for threads that are still starting.
 *
 * Why: the arrays come out in shared memory, so a compute pool over them (`toSharedDataset`) takes them without
 * a copy (a second write of as many fresh bytes: on the 10M-cell file the peak fell from 2.05× to 1.14× the
 * decoded arrays); and the page faults of first writing each part, its conversion and its scans run on the thread
 * that writes it (10M-cell file, quiet 2-core machine: 1.3–1.5 s on two threads against 2.0–2.3 s on one; no gain
 * when another process holds a core; DEVELOPERS.md, "Loading at scale"). Same code per chunk as the one-thread read, parts start on its chunk boundaries: the
 * values and messages are those of a one-thread load (tests/parallel/readParts.test.ts).
 */
import { Worker } from 'node:worker_threads';
import type { PartsJob, ReadParts } from '../io/loadOptions.ts';
import { joinScans, partRanges } from '../io/partReads.ts';
import type { ArrayScan } from '../model/arrayScans.ts';
import { readPartFromFile } from './partFromFile.ts';
import { checkWorkerCount } from './pool.ts';
import { workerEntry } from './workerEntry.ts';

/** Parts per worker and array: small enough that a thread held back by the machine delays the array little. */
const PARTS_PER_WORKER = 8;

/** A part's outcome: the one-thread message of its first bad element, or its scan. */
interface PartReply { id: number; error: string | null; scan: ArrayScan }

/** A `ReadParts` whose parts are read on worker threads (and on the calling thread until they have started); `close` ends them. */
export interface ReadPool {
  readonly readParts: ReadParts;
  readonly workers: number;
  /** Arrays and parts read so far; `partsHere`: of those parts, the ones the calling thread read. */
  readonly done: { arrays: number; parts: number; partsHere: number };
  /**
   * Resolves when every worker has started (posted `{ ready: true }`), so a caller that can wait (a benchmark
   * timing its load apart from start-up) has every part read on a worker; rejects when a worker fails to start.
   */
  ready(): Promise<void>;
  close(): Promise<void>;
}

/** Reads part `[from, to)` of `job` on this thread, as a read worker does (workers/readWorkerBody.ts). */
function readHere(job: PartsJob, from: number, to: number): PartReply {
  try {
    return { id: 0, error: null, scan: readPartFromFile(job, job.out, from, to) };
  } catch (e) {
    return { id: 0, error: e instanceof Error ? e.message : String(e), scan: {} };
  }
}

/** Lets the event loop run (a worker's messages come in) between two parts read on this thread. */
const turn = () => new Promise<void>((r) => setImmediate(r));

/**
 * Starts `n` read workers (1 … 256) at once, so they are ready by the first large array. `minBytes` (tests)
 * overrides the size below which arrays are read on the calling thread; `holdWorkers` (tests) never counts the
 * workers as started, so the calling thread reads every part.
 */
export function startReadPool(n: number, minBytes?: number, holdWorkers = false): ReadPool {
  checkWorkerCount(n, 'read workers');
  const workers = Array.from({ length: n }, () => new Worker(workerEntry('read')));
  const waiting = new Map<number, { resolve: (r: PartReply) => void; reject: (e: Error) => void }>();
  const started: Worker[] = [];
  /** The arrays being read (one at a time, as readers read them, or more), each told of every worker as it starts. */
  const onStart = new Set<(w: Worker) => void>();
  let next = 1;
  let allStarted!: () => void, notStarted!: (e: Error) => void;
  const readyAll = new Promise<void>((res, rej) => { allStarted = res; notStarted = rej; });
  // Nobody may ask: a failed start must not be an unhandled rejection.
  readyAll.catch(() => undefined);
  let startedCount = 0;
  for (const w of workers) {
    w.on('message', (m: PartReply | { ready: true }) => {
      if ('ready' in m) {
        if (++startedCount === workers.length) allStarted();
        if (holdWorkers) return;
        started.push(w);
        for (const serve of onStart) serve(w);
        return;
      }
      const p = waiting.get(m.id);
      waiting.delete(m.id);
      p?.resolve(m);
    });
    w.on('error', (e) => {
      notStarted(new Error(`read worker failed (${e.message})`));
      for (const p of waiting.values()) p.reject(new Error(`read worker failed (${e.message})`));
      waiting.clear();
    });
  }
  const done = { arrays: 0, parts: 0, partsHere: 0 };
  const read = async (job: PartsJob): Promise<ArrayScan> => {
    const { out } = job;
    if (!(out.buffer instanceof SharedArrayBuffer)) throw new Error(`${job.plan.where}: read workers need the array in a SharedArrayBuffer`);
    const ranges = partRanges(job.count, job.step, workers.length * PARTS_PER_WORKER);
    const replies: PartReply[] = new Array(ranges.length);
    // Parts after one that failed are not started: the lowest part that failed holds the array's first bad
    // element, where the one-thread read stops too.
    let nextPart = 0, firstFailed = ranges.length, inFlight = 0;
    const left = (): boolean => nextPart < Math.min(ranges.length, firstFailed);
    const take = (): number => (left() ? nextPart++ : -1);
    const note = (r: number, m: PartReply): void => {
      replies[r] = m;
      done.parts++;
      if (m.error !== null && r < firstFailed) firstFailed = r;
    };
    await new Promise<void>((resolveAll, rejectAll) => {
      let ownDone = false;
      const resolve = (): void => { onStart.delete(serve); resolveAll(); };
      const reject = (e: Error): void => { onStart.delete(serve); rejectAll(e); };
      const finish = (): void => { if (ownDone && inFlight === 0 && !left()) resolve(); };
      const send = (w: Worker, r: number): void => {
        const id = next++;
        inFlight++;
        new Promise<PartReply>((res, rej) => { waiting.set(id, { resolve: res, reject: rej }); }).then((m) => {
          inFlight--;
          note(r, m);
          serve(w);
        }, reject);
        const [from, to] = ranges[r]!;
        w.postMessage({
          id, descriptor: job.descriptor, name: job.name, size: job.size, offset: job.offset, plan: job.plan,
          buffer: out.buffer, byteOffset: out.byteOffset, length: out.length, from, to, step: job.step,
        });
      };
      // Each worker takes the next part when it is done with one, so a thread the machine holds back takes fewer.
      const serve = (w: Worker): void => {
        const r = take();
        if (r >= 0) send(w, r);
        else finish();
      };
      onStart.add(serve);
      for (const w of started) serve(w);
      // This thread reads parts while some worker is still starting.
      void (async () => {
        while (started.length < workers.length) {
          const r = take();
          if (r < 0) break;
          const [from, to] = ranges[r]!;
          note(r, readHere(job, from, to));
          done.partsHere++;
          await turn();
        }
        ownDone = true;
        finish();
      })().catch(reject);
    });
    done.arrays++;
    if (firstFailed < ranges.length) throw new Error(replies[firstFailed]!.error!);
    return joinScans(replies.map((m) => m.scan));
  };
  const readParts: ReadParts = Object.assign(read, { workers: n, ...(minBytes !== undefined ? { minBytes } : {}) });
  return { readParts, workers: n, done, ready: () => readyAll, close: async () => { await Promise.all(workers.map((w) => w.terminate())); } };
}
