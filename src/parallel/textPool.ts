/**
 * Parallel parsing of ASCII arrays (and decoding of uncompressed base64 arrays) under Node (Node only, like inflatePool.ts): a few worker threads
 * (workers/textWorkerBody.ts) parse windows of text from a shared buffer into a shared buffer of doubles, one
 * contiguous run of a batch's windows each (`LoadOptions.parseText`; the reader's side is
 * src/io/asciiWindows.ts). The workers start at the first ASCII or base64 array, so a raw binary file costs no thread.
 * Same parser, same doubles: the arrays are the bits of a one-thread load (tests/parallel/parallelText.test.ts).
 */
import { Worker } from 'node:worker_threads';
import type { Base64Batch, ParseTextBatch } from '../io/loadOptions.ts';
import { checkWorkerCount } from './pool.ts';
import { workerEntry } from './workerEntry.ts';

/** A `ParseTextBatch` and a `Base64Batch` whose windows are handled on worker threads; `close` ends them. */
export interface TextPool {
  readonly parseText: ParseTextBatch;
  readonly decodeBase64: Base64Batch;
  readonly workers: number;
  /** Batches and windows parsed by the workers so far. */
  readonly done: { batches: number; windows: number };
  close(): Promise<void>;
}

/** A pool of `n` text workers (1 … 256), started when first used; `windowBytes` (tests) overrides the 1 MiB windows. */
export function startTextPool(n: number, windowBytes?: number): TextPool {
  checkWorkerCount(n, 'text workers');
  let workers: Worker[] | null = null;
  const waiting = new Map<number, { resolve: (g: (number | string)[]) => void; reject: (e: Error) => void }>();
  let next = 1;
  const done = { batches: 0, windows: 0 };
  const start = (): Worker[] => {
    const ws = Array.from({ length: n }, () => new Worker(workerEntry('text')));
    for (const w of ws) {
      w.on('message', (m: { id: number; got: (number | string)[] }) => { const p = waiting.get(m.id); waiting.delete(m.id); p?.resolve(m.got); });
      w.on('error', (e) => { for (const p of waiting.values()) p.reject(new Error(`text worker failed (${e.message})`)); waiting.clear(); });
    }
    return ws;
  };
  const shared = (a: ArrayBufferView): SharedArrayBuffer => {
    if (!(a.buffer instanceof SharedArrayBuffer) || a.byteOffset !== 0) throw new Error('text workers need windows in a SharedArrayBuffer');
    return a.buffer;
  };
  const run = async (kind: 'numbers' | 'base64', text: Uint8Array, windows: readonly (readonly number[])[], values: ArrayBufferView): Promise<(number | string)[]> => {
    workers ??= start();
    const textBuffer = shared(text), valueBuffer = shared(values);
    // Contiguous runs of windows, one per worker (windows are of about equal size).
    const per = Math.ceil(windows.length / workers.length);
    const runs: Promise<(number | string)[]>[] = [];
    for (let r = 0; r * per < windows.length; r++) {
      const jobs = windows.slice(r * per, (r + 1) * per).flat();
      runs.push(new Promise((resolve, reject) => {
        const id = next++;
        waiting.set(id, { resolve, reject });
        workers![r]!.postMessage({ id, kind, text: textBuffer, values: valueBuffer, jobs });
      }));
    }
    const got = (await Promise.all(runs)).flat();
    done.batches++; done.windows += windows.length;
    return got;
  };
  const sizes = { workers: n, ...(windowBytes ? { windowBytes } : {}) };
  const parseText: ParseTextBatch = Object.assign((t: Uint8Array, w: readonly (readonly number[])[], v: Float64Array) => run('numbers', t, w, v), sizes);
  const decodeBase64: Base64Batch = Object.assign((t: Uint8Array, w: readonly (readonly number[])[], v: Uint8Array) => run('base64', t, w, v), sizes);
  return { parseText, decodeBase64, workers: n, done, close: async () => { if (workers) await Promise.all(workers.map((w) => w.terminate())); } };
}
