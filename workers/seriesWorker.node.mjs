// A series worker under Node (worker_threads): registers the TypeScript loader, evaluates its window of
// steps with the single-thread path (src/series/evaluateSeries.ts) and posts the window's history table,
// its arrays transferred. Messages: {kind: 'step', time} after each step, then {kind: 'done', table} or
// {kind: 'error', message}. The window and the probe set come in workerData (src/parallel/seriesPool.ts).
import { parentPort, workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
try {
  const { evaluateSeries } = await import('../src/series/evaluateSeries.ts');
  const { nodeSeriesFiles } = await import('../src/cli/seriesInputs.ts');
  const table = await evaluateSeries(workerData.index, nodeSeriesFiles, workerData.set, {
    onStep: (_done, _total, time) => parentPort.postMessage({ kind: 'step', time }),
  });
  parentPort.postMessage({ kind: 'done', table }, [table.time.buffer, ...table.columns.map((c) => c.values.buffer)]);
} catch (e) {
  parentPort.postMessage({ kind: 'error', message: e instanceof Error ? e.message : String(e) });
}
