/**
 * Test access to the external VTK files kept in tests/fixtures/external (see SOURCES.md there).
 * Paths are given relative to that folder, e.g. `vtk-data/cow.vtp`.
 */
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import type { ResolveFile } from '../../src/io/loadOptions.ts';
import type { Dataset } from '../../src/model/dataset.ts';

/** Absolute path of the external folder. */
export const EXTERNAL_DIR = resolve(__dirname, '../fixtures/external');

/** Absolute path of an external file, from its path relative to the external folder. */
export function externalPath(rel: string): string {
  return resolve(EXTERNAL_DIR, rel);
}

/** Loads an external file (or set) through the app's own entry point, `loadDatasetFile`. */
export function loadExternal(rel: string): Promise<Dataset> {
  return loadDatasetFile(externalPath(rel));
}

/** The bytes of an external file. */
export function externalBytes(rel: string): Uint8Array {
  const b = readFileSync(externalPath(rel));
  return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
}

/** A `LoadOptions.resolve` that fetches the pieces of the external set `rel` from disk. */
export function externalResolver(rel: string): ResolveFile {
  const folder = dirname(externalPath(rel));
  return async (p) => {
    const b = readFileSync(resolve(folder, p));
    return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
  };
}
