/**
 * Turning the files a user chose (several files, or a folder) into a load request: which one to open,
 * and the others by path relative to it. Also the memory check before a large load (an estimate from the
 * files' size and how they store their arrays).
 */
import type { InputFile, LoadRequest } from '../../workers/api.ts';
import { formatBytes } from '../ui/format.ts';

const SET_FILE = /\.(pvtu|pvtp|vtm)$/i;
const RESULT_FILE = /\.(vtk|vtu|vtp)$/i;

/**
 * Peak memory of a load per byte of file, by how the file stores its arrays: the decoded arrays per file
 * byte times the reader's peak over the decoded arrays, both measured with `fieldtally bench --stages load`
 * on the 1M-cell pipe and sphere of sample-fields/large (compressed 4.0–5.6; text and base64, streamed
 * array by array, 0.50–0.68; raw binary 0.74–0.79; text read whole, as an XML file mixing inline and
 * appended data is, 1.5–1.7), plus a quarter for the boundary surfaces and their drawing (common practice
 * margin), rounded up. Compression ratios vary with the data; smooth fields compress best, so
 * `compressed` errs high.
 */
export const MEMORY_PER_FILE_BYTE = { compressed: 7, text: 2, streamedText: 1, raw: 1, unknown: 2.5 } as const;

export type StorageKind = keyof typeof MEMORY_PER_FILE_BYTE;

/** Bytes read from the start of a file to tell how it stores its arrays. */
const HEAD_BYTES = 4096;

/**
 * How a VTK file stores its arrays, from its first bytes: zlib-compressed XML; text read whole (XML files
 * mixing inline and appended data); text or base64 streamed array by array (ASCII legacy files, XML inline
 * data, base64 appended data); raw binary (raw appended XML, binary legacy files).
 */
export function storageKind(head: string): StorageKind {
  const legacy = /^\s*# vtk DataFile[^\n]*\n[^\n]*\n\s*(ASCII|BINARY)/i.exec(head);
  if (legacy) return legacy[1]!.toUpperCase() === 'ASCII' ? 'streamedText' : 'raw';
  const root = /<VTKFile\b[^>]*>/.exec(head)?.[0];
  if (!root) return 'unknown';
  const formats = new Set([...head.matchAll(/\bformat\s*=\s*["'](ascii|binary|appended)["']/g)].map((m) => m[1]));
  // the compressor applies to binary and appended arrays only
  if (/\bcompressor\s*=\s*["'][^"']+["']/.test(root) && (formats.has('binary') || formats.has('appended'))) return 'compressed';
  const inline = formats.has('ascii') || formats.has('binary');
  if (inline) return formats.has('appended') ? 'text' : 'streamedText';
  if (formats.has('appended')) return /<AppendedData\b[^>]*\bencoding\s*=\s*["']base64["']/.test(head) ? 'streamedText' : 'raw';
  return 'unknown';
}

const sizeOf = (f: InputFile): number => (f.data instanceof Uint8Array ? f.data.length : f.data.size);

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
  return sizeOf(r.main) + r.others.reduce((s, f) => s + sizeOf(f), 0);
}

/**
 * Memory a request will likely need at its peak (bytes): its bytes times the factor for how its largest
 * data file stores its arrays (the set file itself when a set is chosen only holds names). 0 for a URL.
 */
export async function memoryNeeded(r: LoadRequest): Promise<number> {
  if (r.kind === 'url') return 0;
  const files = [r.main, ...r.others];
  const data = r.others.length ? files.reduce((a, b) => (sizeOf(b) > sizeOf(a) ? b : a)) : r.main;
  const head = data.data instanceof Uint8Array ? data.data.subarray(0, HEAD_BYTES) : new Uint8Array(await data.data.slice(0, HEAD_BYTES).arrayBuffer());
  return requestBytes(r) * MEMORY_PER_FILE_BYTE[storageKind(new TextDecoder('latin1').decode(head))];
}

/**
 * A warning when a load of `bytes` that needs about `need` bytes of memory would likely need more than
 * the page may use, or undefined. Uses the JS heap limit where the browser tells it, else the device memory.
 */
export function memoryWarning(bytes: number, need: number): string | undefined {
  const heap = (performance as Performance & { memory?: { jsHeapSizeLimit: number } }).memory?.jsHeapSizeLimit;
  const device = typeof navigator === 'undefined' ? undefined : (navigator as Navigator & { deviceMemory?: number }).deviceMemory;
  const limit = heap ?? (device ? device * 1e9 / 2 : undefined);
  if (!limit || need <= limit) return undefined;
  return `These files (${formatBytes(bytes)}) need about ${formatBytes(need)} of memory to open; this page can use about ${formatBytes(limit)}. The tab may run out of memory. Open anyway?`;
}
