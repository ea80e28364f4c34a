/**
 * Whether the files a user chose (several files, or a folder) are a series of steps rather than one
 * result: a `.pvd` collection among them, or two or more step files (numbered result files, or the set
 * files of a folder whose pieces they list). Pure: no DOM beyond the `File` objects' names.
 */
import type { InputFile } from '../../workers/api.ts';
import { isStepFile, stepFilesOfFolder } from '../series/numberedFiles.ts';

/** A chosen series: its collection file or its ordered step files, every chosen file by its path. */
export interface SeriesChoice {
  /** Name for messages: the collection file, or the folder / first step's name. */
  name: string;
  /** Path of the `.pvd` file, when the series is a collection. */
  collection?: string;
  /** Step files in step order (numbered sequences), when there is no collection. */
  steps?: string[];
  /** Every chosen file, by its path relative to the chosen folder (or its name). */
  files: InputFile[];
}

const pathOf = (f: File): string => f.webkitRelativePath || f.name;

/**
 * The series among `files`, or null when they are one result (a single file, one set with its pieces, or
 * a folder of several sets that are not numbered steps). Throws the series code's one-line error when
 * result files do not form one numbered sequence.
 */
export function seriesChoiceFor(files: readonly File[]): SeriesChoice | null {
  const inputs: InputFile[] = files.map((f) => ({ path: pathOf(f), data: f }));
  const paths = inputs.map((f) => f.path);
  const collections = paths.filter((p) => /\.pvd$/i.test(p));
  const folder = paths[0]?.includes('/') ? paths[0].slice(0, paths[0].indexOf('/')) : '';
  if (collections.length > 1) {
    throw new Error(`${collections.length} collection files chosen (${collections.slice(0, 3).join(', ')}); choose one .pvd with its step files`);
  }
  if (collections.length === 1) return { name: collections[0]!.split('/').pop()!, collection: collections[0]!, files: inputs };
  const candidates = paths.filter(isStepFile);
  // one set file with its pieces is one result; so is a single file
  const sets = candidates.filter((p) => /\.(pvtu|pvtp|vtm)$/i.test(p));
  if (sets.length === 1 || (sets.length === 0 && candidates.length < 2)) return null;
  let steps: string[];
  try {
    steps = stepFilesOfFolder(candidates, folder || `${candidates.length} chosen files`);
  } catch (e) {
    // a folder of several unrelated sets opens its shallowest set, as before series existed
    if (sets.length >= 2) return null;
    throw e;
  }
  if (steps.length < 2) return null;
  const base = (p: string) => p.split('/').pop()!;
  return { name: folder || `${base(steps[0]!)} … ${base(steps[steps.length - 1]!)}`, steps, files: inputs };
}
