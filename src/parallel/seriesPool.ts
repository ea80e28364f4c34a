/**
 * A series evaluated on several worker threads at once (Node only, like nodePool.ts): the steps of the
 * window are split into contiguous runs, one per worker (`seriesWindows.ts`), so each worker keeps the
 * mesh reuse within its run; each worker (workers/seriesWorker.node.mjs) evaluates its run with the
 * single-thread path and returns its history table by transfer; the tables are joined in step order into
 * the table one thread gives (same numbers, names, columns and failures; tested for 1, 2 and 3 workers).
 *
 * Errors: the first failing step in step order is reported, with the message one thread gives (it names
 * the step's file). Cancel: aborting `signal` ends every worker and rejects with an AbortError.
 */
import { Worker } from 'node:worker_threads';
import { evaluateSeries, type SeriesOptions } from '../series/evaluateSeries.ts';
import type { HistoryTable } from '../series/historyTable.ts';
import { stepsInWindow, type SeriesIndex } from '../series/seriesIndex.ts';
import { abortError, type SeriesFiles } from '../series/seriesOpen.ts';
import type { ProbeSet } from '../study/probeSet.ts';
import { checkWorkerCount } from './pool.ts';
import { joinHistoryTables, stepWindows, windowIndex } from './seriesWindows.ts';
import { workerEntry } from './workerEntry.ts';

/** Options of `evaluateSeriesOnWorkers`: those of `evaluateSeries` (its `load` options are not passed to workers) and the worker count. */
export interface ParallelSeriesOptions extends Omit<SeriesOptions, 'load'> {
  /** Worker threads (1 … 256); 1 runs `evaluateSeries` in this thread with `files`. Never more than steps. */
  workers: number;
}

type Reply = { kind: 'step'; time: number } | { kind: 'done'; table: HistoryTable } | { kind: 'error'; message: string };

/**
 * The history table of `set` over the series, its steps evaluated on `o.workers` threads reading files
 * from disk (paths as in the index, relative to the working folder). `files` is used only for one worker.
 * Progress `onStep(done, total, time)`: `done` counts steps finished by all workers; `time` is the step
 * just finished by one of them (not in time order across workers).
 */
export async function evaluateSeriesOnWorkers(index: SeriesIndex, files: SeriesFiles, set: ProbeSet, o: ParallelSeriesOptions): Promise<HistoryTable> {
  const workers = checkWorkerCount(o.workers, '--workers');
  const steps = stepsInWindow(index, o.from, o.to);
  const windows = stepWindows(steps, workers);
  if (windows.length === 1) {
    const { workers: _w, ...single } = o;
    return evaluateSeries(index, files, set, single);
  }
  if (o.signal?.aborted) throw abortError(index.name);
  const total = steps.length;
  let done = 0;
  const threads: Worker[] = [];
  const results = windows.map((w) => new Promise<HistoryTable>((resolve, reject) => {
    const t = new Worker(workerEntry('series'), { workerData: { index: windowIndex(index, w), set } });
    threads.push(t);
    let settled = false;
    t.on('message', (r: Reply) => {
      if (r.kind === 'step') { o.onStep?.(++done, total, r.time); return; }
      settled = true;
      if (r.kind === 'done') resolve(r.table); else reject(new Error(r.message));
    });
    t.on('error', (e) => { settled = true; reject(new Error(`series worker failed (${e.message})`)); });
    t.on('exit', (code) => { if (!settled) reject(new Error(`series worker stopped with exit code ${code}`)); });
  }));
  // Unhandled rejections of later windows are read below or dropped on purpose after an earlier error.
  for (const r of results) r.catch(() => {});
  const stopAll = () => Promise.all(threads.map((t) => t.terminate()));
  const aborted = new Promise<never>((_, reject) => {
    o.signal?.addEventListener('abort', () => reject(abortError(index.name)), { once: true });
  });
  aborted.catch(() => {});
  try {
    const tables: HistoryTable[] = [];
    // In window order, so the error reported is that of the first failing step, as with one thread.
    for (const r of results) tables.push(await Promise.race([r, aborted]));
    return joinHistoryTables(tables);
  } finally {
    await stopAll();
  }
}
