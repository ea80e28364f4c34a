/**
 * Evaluates a probe set at every step of a series, streaming: one step is read — an XML step's geometry
 * arrays whose file bytes equal the previous step's are not decoded again (`LoadOptions.geometryBefore`) —
 * its mesh matched against the step before (`reuseMesh`: identical geometry bytes share the previous
 * step's arrays, so the cell tree, boundary faces, wall-gradient plans and cut geometry cached by mesh
 * are reused), every probe evaluated (`evaluateProbeSet`, the path
 * of `report`), its numbers kept and the step dropped. At most the current step's decoded arrays, the one
 * being read and the shared geometry are resident — never the whole series.
 */
import type { LoadOptions } from '../io/loadOptions.ts';
import type { Dataset } from '../model/dataset.ts';
import { geometryOnly } from '../model/meshKey.ts';
import { evaluateProbeSet } from '../study/evaluate.ts';
import type { ProbeSet } from '../study/probeSet.ts';
import { HistoryBuilder, type HistoryTable } from './historyTable.ts';
import { reuseMesh } from './meshReuse.ts';
import { abortError, loadStep, type SeriesFiles } from './seriesOpen.ts';
import { stepsInWindow, type SeriesIndex } from './seriesIndex.ts';

/** One step as streamed. */
export interface StreamedStep {
  /** Index of the step in the series. */
  step: number;
  /** Its time (time unit of the series). */
  time: number;
  dataset: Dataset;
  /** True when the step's mesh is the previous step's (same geometry arrays, cached structures reused). */
  meshReused: boolean;
}

/** Options of `streamSeries` / `evaluateSeries`; all optional. */
export interface SeriesOptions {
  /** Window of times to read (time unit, inclusive); default: every step. */
  from?: number;
  to?: number;
  /** Stops at the next step (rejects with an AbortError). */
  signal?: AbortSignal;
  /** Called after every step with the steps done and the steps to do. */
  onStep?: (done: number, total: number, time: number) => void;
  /** Passed to the readers (progress, inflater). */
  load?: LoadOptions;
}

/** Reads the steps in the window one after the other, reusing the mesh between steps that share it. */
export async function* streamSeries(index: SeriesIndex, files: SeriesFiles, o: SeriesOptions = {}): AsyncGenerator<StreamedStep> {
  let geometry: Dataset | null = null;
  for (const i of stepsInWindow(index, o.from, o.to)) {
    if (o.signal?.aborted) throw abortError(index.name);
    // the freshly read step goes out of scope here, so its duplicate geometry is not held while the step is evaluated
    // the reader takes the previous step's geometry arrays where the file holds the same bytes (XML raw appended data)
    const opts = { ...o.load, ...(o.signal ? { signal: o.signal } : {}), ...(geometry ? { geometryBefore: geometry } : {}) };
    const { dataset, reused } = reuseMesh(geometry, await loadStep(index, i, files, opts));
    // keep only the geometry of this step for the next comparison: its fields may go once it is evaluated
    geometry = reused ? geometry : geometryOnly(dataset);
    yield { step: i, time: index.steps[i]!.time, dataset, meshReused: reused };
  }
}

/** The history table of a probe set over a series (see the file comment). */
export async function evaluateSeries(index: SeriesIndex, files: SeriesFiles, set: ProbeSet, o: SeriesOptions = {}): Promise<HistoryTable> {
  const builder = new HistoryBuilder(index.name, index.timeSource);
  const total = stepsInWindow(index, o.from, o.to).length;
  let done = 0;
  for await (const s of streamSeries(index, files, o)) {
    builder.add(s.time, evaluateProbeSet(s.dataset, set), s.meshReused);
    o.onStep?.(++done, total, s.time);
    // let a cancel message reach a worker between steps
    if (o.signal) await new Promise<void>((r) => setTimeout(r, 0));
  }
  return builder.table();
}
