/**
 * Loading from the local file system (command line and tests, Node only): reads the file and resolves
 * the pieces of a set from the set file's folder.
 */
import { readFile, stat } from 'node:fs/promises';
import { basename, dirname, resolve as resolvePath } from 'node:path';
import type { Dataset } from '../model/dataset.ts';
import type { LoadOptions } from './loadOptions.ts';
import { readDataset } from './readDataset.ts';

/** Reads a whole file as bytes, with an error naming the path if it cannot. */
export async function readBytes(path: string): Promise<Uint8Array> {
  try {
    const b = await readFile(path);
    return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new Error(`${path}: cannot read file (${code === 'ENOENT' ? 'no such file' : code ?? String(e)})`);
  }
}

/** Loads a dataset from a path; pieces of `.pvtu`/`.vtm` sets resolve relative to the set file's folder. */
export async function loadDatasetFile(path: string, opts: LoadOptions = {}): Promise<Dataset> {
  const folder = dirname(resolvePath(path));
  const bytes = await readBytes(path);
  return readDataset(basename(path), bytes, {
    ...opts,
    resolve: opts.resolve ?? (async (rel) => {
      const full = resolvePath(folder, rel);
      try { await stat(full); } catch {
        throw new Error(`${basename(path)}: piece "${rel}" is missing (looked for ${full})`);
      }
      return readBytes(full);
    }),
  });
}
