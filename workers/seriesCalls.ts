/**
 * The series side of the compute worker (the calls `openSeries`, `showStep`, `evaluateSeries` and
 * `cancelSeries` of workers/api.ts): the chosen files as `SeriesFiles` (read by ranges of their Blobs),
 * the series index, the step shown (its mesh reused from the step shown before when the geometry bytes
 * match, so the boundary faces and cell tree are not rebuilt while stepping), and a streamed evaluation
 * of a probe set over every step with progress and cancel.
 */
import { blobSource } from '../src/io/blobSource.ts';
import { bytesSource, type ByteSource } from '../src/io/byteSource.ts';
import { readFieldDataOnly } from '../src/io/fieldDataOnly.ts';
import { readDatasetFrom } from '../src/io/readDataset.ts';
import type { Dataset } from '../src/model/dataset.ts';
import { geometryOnly } from '../src/model/meshKey.ts';
import { evaluateSeries, type SeriesOptions } from '../src/series/evaluateSeries.ts';
import type { HistoryTable } from '../src/series/historyTable.ts';
import { reuseMesh } from '../src/series/meshReuse.ts';
import { stepFilesOfFolder } from '../src/series/numberedFiles.ts';
import { loadStep, openCollection, openNumbered, type SeriesFiles } from '../src/series/seriesOpen.ts';
import { timeSourceStatement, timeUnit, type SeriesIndex } from '../src/series/seriesIndex.ts';
import type { ProbeSet } from '../src/study/probeSet.ts';
import type { InputFile, SeriesDescription } from './api.ts';

/** `a/./b/../c` → `a/c`, backslashes to slashes. */
export function normalisePath(p: string): string {
  const out: string[] = [];
  for (const s of p.replace(/\\/g, '/').split('/')) {
    if (s === '' || s === '.') continue;
    if (s === '..') out.pop(); else out.push(s);
  }
  return out.join('/');
}

const sourceOf = (data: Blob | Uint8Array, name: string): ByteSource => (data instanceof Uint8Array ? bytesSource(name, data) : blobSource(data, name));
const baseName = (p: string): string => p.split('/').pop()!;

/**
 * Series file access that counts the bytes of the files its loads open (step files and set pieces) in
 * `meter`; `counting()` gives the same access with a meter of its own (so a step shown while a history
 * runs counts only its own files).
 */
export type MeteredFiles = SeriesFiles & { readonly meter: { bytes: number }; counting(): MeteredFiles };

/** The chosen files as series file access; a path not among them is an error naming it. */
export function chosenFiles(list: readonly InputFile[]): MeteredFiles {
  const byPath = new Map(list.map((f) => [normalisePath(f.path), f]));
  const get = (path: string, from?: string): InputFile => {
    const want = normalisePath(path);
    const f = byPath.get(want) ?? [...byPath.values()].filter((x) => baseName(normalisePath(x.path)) === baseName(want)).at(0);
    if (!f) throw new Error(`${from ? `${from}: ` : ''}"${path}" is missing: choose it together with the series (or open the folder)`);
    return f;
  };
  const meter = { bytes: 0 };
  const opened = (src: ByteSource): ByteSource => { meter.bytes += src.size; return src; };
  return {
    meter,
    counting: () => chosenFiles(list),
    async text(path) {
      const f = get(path);
      return f.data instanceof Uint8Array ? new TextDecoder().decode(f.data) : f.data.text();
    },
    async load(path, opts) {
      const f = get(path);
      const folder = path.includes('/') ? path.slice(0, path.lastIndexOf('/') + 1) : '';
      return readDatasetFrom(opened(sourceOf(f.data, baseName(path))), {
        ...opts,
        resolveSource: async (rel) => { const p = get(folder + rel, baseName(path)); return opened(sourceOf(p.data, baseName(rel))); },
      });
    },
    async fieldData(path) {
      const folder = path.includes('/') ? path.slice(0, path.lastIndexOf('/') + 1) : '';
      return readFieldDataOnly(sourceOf(get(path).data, baseName(path)), {
        resolveSource: async (rel) => { const p = get(folder + rel, baseName(path)); return sourceOf(p.data, baseName(rel)); },
      });
    },
  };
}

/** The index of the chosen files: their one `.pvd`, else their numbered result files (set files first). */
export async function openChosenSeries(list: readonly InputFile[], files: SeriesFiles, signal?: AbortSignal): Promise<SeriesIndex> {
  const paths = list.map((f) => normalisePath(f.path));
  const pvds = paths.filter((p) => p.toLowerCase().endsWith('.pvd'));
  if (pvds.length > 1) throw new Error(`${pvds.length} collection files chosen (${pvds.map(baseName).join(', ')}); choose one`);
  if (pvds.length === 1) return openCollection(pvds[0]!, files);
  const folder = paths[0]?.includes('/') ? `${paths[0].slice(0, paths[0].lastIndexOf('/'))}/` : 'chosen files';
  return openNumbered(folder, stepFilesOfFolder(paths, folder), files, signal);
}

/** What the UI shows of a series. */
export function describeSeries(index: SeriesIndex): SeriesDescription {
  return {
    name: index.name, timeSource: index.timeSource, timeSourceStatement: timeSourceStatement(index.timeSource), timeUnit: timeUnit(index.timeSource),
    times: index.steps.map((s) => s.time), stepFiles: index.steps.map((s) => [...s.files]),
  };
}

/** An open series in the worker: its index, file access and the geometry of the step shown last. */
export class OpenSeries {
  private geometry: Dataset | null = null;
  constructor(readonly index: SeriesIndex, readonly files: SeriesFiles | MeteredFiles) {}

  /**
   * Reads step `i`, reusing the last shown step's mesh when the bytes match (the reader takes its geometry
   * arrays where the raw bytes are equal). `fileBytes`: bytes of the files the step opened (0 when the file
   * access does not count them).
   */
  async step(i: number, signal?: AbortSignal): Promise<{ dataset: Dataset; reused: boolean; time: number; fileBytes: number }> {
    if (!Number.isInteger(i) || i < 0 || i >= this.index.steps.length) throw new Error(`step ${i}: expected a whole number from 0 to ${this.index.steps.length - 1}`);
    const files: SeriesFiles & { meter?: { bytes: number } } = 'counting' in this.files ? this.files.counting() : this.files;
    const read = await loadStep(this.index, i, files, { ...(signal ? { signal } : {}), ...(this.geometry ? { geometryBefore: this.geometry } : {}) });
    const { dataset, reused } = reuseMesh(this.geometry, read);
    this.geometry = reused ? this.geometry : geometryOnly(dataset);
    return { dataset, reused, time: this.index.steps[i]!.time, fileBytes: files.meter?.bytes ?? 0 };
  }

  /** The probe set over the steps of the window (see `evaluateSeries`). */
  history(set: ProbeSet, o: SeriesOptions): Promise<HistoryTable> {
    return evaluateSeries(this.index, this.files, set, o);
  }
}
