/**
 * What the series verbs read from disk (Node only): the series named on the command line — a `.pvd`
 * collection file, a folder (its one `.pvd`, else its numbered result files), a pattern, or several files
 * — as a series index, and the file access (`SeriesFiles`) the streaming evaluation reads steps through.
 */
import { readdirSync, statSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { basename, dirname, join, resolve as resolvePath } from 'node:path';
import { readFieldDataOnly } from '../io/fieldDataOnly.ts';
import { loadDatasetFile, nodeInflate, openFileSource } from '../io/nodeFiles.ts';
import { stepFilesOfFolder } from '../series/numberedFiles.ts';
import { openCollection, openNumbered, type SeriesFiles } from '../series/seriesOpen.ts';
import type { SeriesIndex } from '../series/seriesIndex.ts';
import { expandInputs, isGlob } from './fileGlob.ts';

/** Files on disk, by path (relative to the working folder or absolute). */
export const nodeSeriesFiles: SeriesFiles = {
  async text(path) {
    try { return await readFile(path, 'utf8'); } catch (e) {
      throw new Error(`${path}: cannot read file (${(e as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : String(e)})`);
    }
  },
  load: (path, opts) => loadDatasetFile(path, opts ?? {}),
  async fieldData(path) {
    const src = await openFileSource(path);
    // a set's field data lies in its pieces, resolved next to the set file
    const folder = dirname(resolvePath(path));
    try {
      return await readFieldDataOnly(src, { inflate: nodeInflate, resolveSource: (rel) => openFileSource(resolvePath(folder, rel)) });
    } finally { await src.close(); }
  },
};

const isPvd = (p: string): boolean => p.toLowerCase().endsWith('.pvd');
const isDir = (p: string): boolean => { try { return statSync(p).isDirectory(); } catch { return false; } };

/** Whether command-line inputs name a series rather than single result files: a `.pvd`, a folder. */
export function looksLikeSeries(input: string): boolean {
  return isPvd(input) || isDir(input);
}

/** The series named by the command-line inputs (see the file comment); errors name the input. */
export async function openSeriesInput(inputs: readonly string[], files: SeriesFiles = nodeSeriesFiles): Promise<SeriesIndex> {
  if (inputs.length === 0) throw new Error('give a series: a .pvd collection file, a folder of numbered result files, a pattern such as "run/flow_*.vtu", or several files');
  if (inputs.length === 1 && isPvd(inputs[0]!)) return openCollection(inputs[0]!, files);
  if (inputs.length === 1 && isDir(inputs[0]!)) {
    const dir = inputs[0]!;
    const names = readdirSync(dir).sort();
    const pvds = names.filter(isPvd);
    if (pvds.length > 1) throw new Error(`${dir}: holds ${pvds.length} collection files (${pvds.join(', ')}); name the one to read`);
    if (pvds.length === 1) return openCollection(join(dir, pvds[0]!), files);
    return openNumbered(basename(dir.replace(/[\\/]+$/, '')) + '/', stepFilesOfFolder(names, dir).map((n) => join(dir, n)), files);
  }
  const paths = expandInputs(inputs);
  const pvd = paths.find(isPvd);
  if (pvd) throw new Error(`${pvd}: a collection file is a whole series; give it alone`);
  const name = inputs.length === 1 && isGlob(inputs[0]!) ? inputs[0]! : `${paths.length} files`;
  return openNumbered(name, paths, files);
}
