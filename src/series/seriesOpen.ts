/**
 * Builds a series index and reads its steps through a small file-access interface, so the same code runs
 * in the command line (files on disk) and in the worker (files the user chose). A collection file gives
 * the times; a numbered sequence takes each file's `TimeValue` field data (a quick pass that decodes only
 * the field data), else the step index.
 */
import type { LoadOptions } from '../io/loadOptions.ts';
import type { Dataset } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import { parseCollection } from './collection.ts';
import { orderNumbered } from './numberedFiles.ts';
import { checkIncreasingTimes, type SeriesIndex } from './seriesIndex.ts';
import { timeFromFieldData, TIME_ARRAY } from './stepTime.ts';

/** How the series code reaches files: paths are relative to the series' folder, `/`-separated. */
export interface SeriesFiles {
  /** Reads a text file (the collection file). */
  text(path: string): Promise<string>;
  /** Reads a result file or set (its pieces resolved next to it) as a dataset. */
  load(path: string, opts?: LoadOptions): Promise<Dataset>;
  /** Reads only the dataset-level field data of a result file. */
  fieldData(path: string): Promise<FieldArray[]>;
}

const baseName = (p: string): string => p.split('/').pop()!;

/** The index of a `.pvd` collection file; step files are made relative to the series' folder. */
export async function openCollection(path: string, files: SeriesFiles): Promise<SeriesIndex> {
  const index = parseCollection(await files.text(path), baseName(path));
  const folder = path.includes('/') ? path.slice(0, path.lastIndexOf('/') + 1) : '';
  for (const s of index.steps) s.files = s.files.map((f) => (f.startsWith('/') ? f : folder + f));
  return index;
}

/**
 * The index of a numbered sequence (`paths` in any order; ordered here by number). Times come from every
 * file's `TimeValue` when the files carry one (all must), else from the step index. `name` names the
 * sequence (its folder or pattern) in messages.
 */
export async function openNumbered(name: string, paths: readonly string[], files: SeriesFiles, signal?: AbortSignal): Promise<SeriesIndex> {
  const ordered = orderNumbered(paths, name);
  const times: (number | undefined)[] = [];
  for (const p of ordered) {
    if (signal?.aborted) throw abortError(name);
    times.push(timeFromFieldData(await files.fieldData(p), baseName(p)));
  }
  const have = times.filter((t) => t !== undefined).length;
  if (have > 0 && have < times.length) {
    const i = times.findIndex((t) => t === undefined), j = times.findIndex((t) => t !== undefined);
    throw new Error(`${name}: ${baseName(ordered[i]!)} has no ${TIME_ARRAY} field data while ${baseName(ordered[j]!)} has one; a series takes its times from every file or from none`);
  }
  const index: SeriesIndex = {
    name,
    steps: ordered.map((p, i) => ({ time: have ? times[i]! : i, files: [p], where: baseName(p) })),
    timeSource: have ? 'field-data' : 'step-index',
  };
  checkIncreasingTimes(index);
  return index;
}

/** An Error named 'AbortError' (what readers throw when cancelled). */
export function abortError(where: string): Error {
  const e = new Error(`${where}: cancelled`);
  e.name = 'AbortError';
  return e;
}

/** Several parts of one step as one dataset (pieces in part order; field data of the first part that has each name). */
export function joinParts(parts: readonly Dataset[], source: string): Dataset {
  if (parts.length === 1) return parts[0]!;
  const fieldData: FieldArray[] = [];
  const fileCellTypes: Record<number, number> = {};
  for (const d of parts) {
    for (const f of d.fieldData) if (!fieldData.some((g) => g.name === f.name)) fieldData.push(f);
    for (const [t, n] of Object.entries(d.fileCellTypes)) fileCellTypes[Number(t)] = (fileCellTypes[Number(t)] ?? 0) + n;
  }
  return {
    source, kind: parts.some((d) => d.kind === 'unstructured') ? 'unstructured' : 'polydata',
    pieces: parts.flatMap((d) => d.pieces), fieldData, warnings: parts.flatMap((d) => d.warnings.map((w) => `${d.source}: ${w}`)), fileCellTypes,
  };
}

/** Reads step `i` of a series (all its parts), with errors naming the step's line or file. */
export async function loadStep(index: SeriesIndex, i: number, files: SeriesFiles, opts: LoadOptions = {}): Promise<Dataset> {
  const step = index.steps[i];
  if (!step) throw new Error(`${index.name}: no step ${i} (the series has ${index.steps.length})`);
  const parts: Dataset[] = [];
  for (const f of step.files) {
    try {
      parts.push(await files.load(f, opts));
    } catch (e) {
      if (e instanceof Error && e.name !== 'AbortError' && step.where !== baseName(f)) e.message = `${step.where}: ${e.message}`;
      throw e;
    }
  }
  const d = joinParts(parts, step.files.length === 1 ? baseName(step.files[0]!) : `${step.where} (${step.files.length} parts)`);
  if (index.timeSource === 'field-data') {
    const t = timeFromFieldData(d.fieldData, d.source);
    if (t !== step.time) throw new Error(`${d.source}: ${TIME_ARRAY} is now ${t}, was ${step.time} when the series was opened (the file changed?)`);
  }
  return d;
}
