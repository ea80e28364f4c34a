// A series worker under Node (worker_threads): evaluates its window of steps with the single-thread path
// (src/series/evaluateSeries.ts) and posts the window's history table, its arrays transferred. Messages:
// {kind: 'step', time} after each step, then {kind: 'done', table} or {kind: 'error', message}. The window
// and the probe set come in workerData (src/parallel/seriesPool.ts). Started through
// workers/seriesWorker.node.mjs from source, or bundled as dist-cli/seriesWorker.mjs (bin/build-cli.mjs).
import { parentPort, workerData } from 'node:worker_threads';
import { evaluateSeries } from '../src/series/evaluateSeries.ts';
import { nodeSeriesFiles } from '../src/cli/seriesInputs.ts';

const port = parentPort!;
try {
  const table = await evaluateSeries(workerData.index, nodeSeriesFiles, workerData.set, {
    onStep: (_done, _total, time) => port.postMessage({ kind: 'step', time }),
  });
  port.postMessage({ kind: 'done', table }, [table.time.buffer as ArrayBuffer, ...table.columns.map((c) => c.values.buffer as ArrayBuffer)]);
} catch (e) {
  port.postMessage({ kind: 'error', message: e instanceof Error ? e.message : String(e) });
}
