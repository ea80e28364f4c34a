/**
 * A series as the study verbs take it (`report`, `compare`): its history over the probe set, the window
 * statistics of every quantity, and its files as report inputs (each with its size and SHA-256). Node only.
 */
import { createHash } from 'node:crypto';
import { basename } from 'node:path';
import { readBytes } from '../io/nodeFiles.ts';
import { evaluateSeriesOnWorkers } from '../parallel/seriesPool.ts';
import { stepsInWindow } from '../series/seriesIndex.ts';
import { summarizeTable, type ColumnSummary } from '../series/historyStats.ts';
import type { HistoryTable } from '../series/historyTable.ts';
import { resolveReference } from '../study/outcome.ts';
import type { ProbeSet } from '../study/probeSet.ts';
import type { InputFileInfo } from '../study/reportHtml.ts';
import { nodeSeriesFiles, openSeriesInput } from './seriesInputs.ts';
import { seriesWorkerCount } from './workerOption.ts';

/** One evaluated series. */
export interface SeriesStudy {
  name: string;
  table: HistoryTable;
  summaries: ColumnSummary[];
  inputs: InputFileInfo[];
}

/**
 * Evaluates a probe set over the series named by `input` (a .pvd or a folder) and summarises every quantity;
 * `workers` is the `--workers` option (threads evaluating runs of steps, `seriesWorkerCount`).
 */
export async function studySeries(input: string, set: ProbeSet, withInputs = false, workers?: string): Promise<SeriesStudy> {
  const index = await openSeriesInput([input]);
  const table = await evaluateSeriesOnWorkers(index, nodeSeriesFiles, set, { workers: seriesWorkerCount(workers, stepsInWindow(index).length) });
  const summaries = summarizeTable(table, { reference: resolveReference(set.reference) });
  const inputs: InputFileInfo[] = [];
  if (withInputs) {
    if (input.toLowerCase().endsWith('.pvd')) inputs.push(await info(input, 'collection file'));
    for (const s of index.steps) for (const f of s.files) inputs.push(await info(f, `step at t = ${s.time} of ${index.name}`));
  }
  return { name: input, table, summaries, inputs };
}

async function info(path: string, role: string): Promise<InputFileInfo> {
  const b = await readBytes(path);
  return { name: basename(path), bytes: b.length, sha256: createHash('sha256').update(b).digest('hex'), role };
}
