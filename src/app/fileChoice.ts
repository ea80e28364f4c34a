/**
 * Turning the files a user chose (several files, or a folder) into a load request: which one to open,
 * and the others by path relative to it. Also the memory check before a large load.
 */
import type { InputFile, LoadRequest } from '../../workers/api.ts';
import { formatBytes } from '../ui/format.ts';

const SET_FILE = /\.(pvtu|pvtp|vtm)$/i;
const RESULT_FILE = /\.(vtk|vtu|vtp)$/i;

/** Memory a load needs relative to the file size (decoded arrays plus derived surfaces; common practice estimate). */
export const MEMORY_PER_FILE_BYTE = 2.5;

/** The path of a chosen file: its path inside a chosen folder, or its name. */
function pathOf(f: File): string {
  return f.webkitRelativePath || f.name;
}

/**
 * Picks the file to open: the only file; else the set file (the shallowest one if a folder holds
 * several); else an error naming the choice that is needed.
 */
export function loadRequestFor(files: readonly File[]): LoadRequest {
  if (files.length === 0) throw new Error('no file chosen');
  const inputs: InputFile[] = files.map((f) => ({ path: pathOf(f), data: f }));
  const sets = inputs.filter((f) => SET_FILE.test(f.path)).sort((a, b) => a.path.split('/').length - b.path.split('/').length || (a.path < b.path ? -1 : 1));
  let main: InputFile | undefined = sets[0];
  if (!main) {
    const results = inputs.filter((f) => RESULT_FILE.test(f.path));
    if (inputs.length === 1) main = inputs[0];
    else if (results.length === 1) main = results[0];
    else throw new Error(`${inputs.length} files chosen and none is a set file (.pvtu, .vtm): choose one result file, or a set file together with its pieces`);
  }
  return { kind: 'files', main: main!, others: inputs.filter((f) => f !== main) };
}

/** Total bytes of a request's files. */
export function requestBytes(r: LoadRequest): number {
  if (r.kind === 'url') return 0;
  const size = (f: InputFile) => (f.data instanceof Uint8Array ? f.data.length : f.data.size);
  return size(r.main) + r.others.reduce((s, f) => s + size(f), 0);
}

/**
 * A warning when a load of `bytes` would likely need more memory than the page may use, or undefined.
 * Uses the JS heap limit where the browser tells it, else the device memory.
 */
export function memoryWarning(bytes: number): string | undefined {
  const need = bytes * MEMORY_PER_FILE_BYTE;
  const heap = (performance as Performance & { memory?: { jsHeapSizeLimit: number } }).memory?.jsHeapSizeLimit;
  const device = (navigator as Navigator & { deviceMemory?: number }).deviceMemory;
  const limit = heap ?? (device ? device * 1e9 / 2 : undefined);
  if (!limit || need <= limit) return undefined;
  return `These files (${formatBytes(bytes)}) need about ${formatBytes(need)} of memory to open; this page can use about ${formatBytes(limit)}. The tab may run out of memory. Open anyway?`;
}
