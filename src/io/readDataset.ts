/**
 * One entry point for every supported file: picks the reader from the file's first bytes (falling
 * back to its extension for the message) and returns the dataset. Runs in the worker, the CLI and tests.
 */
import type { Dataset } from '../model/dataset.ts';
import { bytesSource, type ByteSource } from './byteSource.ts';
import { readWhole } from './sourceArrays.ts';
import type { LoadOptions } from './loadOptions.ts';
import { withMemoryBudget } from './memoryBudget.ts';
import { asOneLineError, quoteBytes } from './messageText.ts';
import { readLegacyVtkFrom } from './vtkLegacy.ts';
import { readVtkSet } from './vtkSets.ts';
import { readVtkXmlFrom } from './vtkXml.ts';

/** The kinds of input this reader dispatch knows. */
export type InputFormat = 'legacy' | 'xml' | 'unknown';

/** Bytes read to tell the format and the XML root's type. */
const SNIFF_BYTES = 4096;

/** Longest XML prolog (declaration, comments, processing instructions, doctype) looked through for the root. */
export const MAX_PROLOG_BYTES = 64 << 20;

/**
 * Where the root element's `<` is in an XML file's first bytes, skipping the prolog (whitespace, a
 * byte-order mark, `<?…?>`, `<!--…-->`, `<!…>`): its offset, 'more' when the bytes end inside the
 * prolog, or −1 when something else comes first.
 */
export function rootStart(bytes: Uint8Array): number | 'more' {
  let p = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  const n = bytes.length;
  for (;;) {
    while (p < n && (bytes[p] === 32 || bytes[p] === 10 || bytes[p] === 13 || bytes[p] === 9)) p++;
    if (p >= n) return 'more';
    if (bytes[p] !== 60) return -1;
    if (p + 4 > n) return 'more';
    const c = bytes[p + 1];
    let end: number;
    if (c === 63) end = findSeq(bytes, [63, 62], p + 2);
    else if (c === 33 && bytes[p + 2] === 45 && bytes[p + 3] === 45) end = findSeq(bytes, [45, 45, 62], p + 4);
    else if (c === 33) end = findSeq(bytes, [62], p + 2);
    else return p;
    if (end < 0) return 'more';
    p = end;
  }
}

/** Position just after `seq` in `bytes` from `from`, or −1. */
function findSeq(bytes: Uint8Array, seq: number[], from: number): number {
  for (let i = bytes.indexOf(seq[0]!, from); i >= 0; i = bytes.indexOf(seq[0]!, i + 1)) {
    let k = 1;
    while (k < seq.length && bytes[i + k] === seq[k]) k++;
    if (k === seq.length) return i + k;
  }
  return -1;
}

/** Looks at the first bytes: legacy files start with `# vtk DataFile`, XML files have `<VTKFile` as their root. */
export function sniffFormat(bytes: Uint8Array): InputFormat {
  const head = new TextDecoder('latin1').decode(bytes.subarray(0, Math.min(bytes.length, 1024)));
  if (/^\s*# vtk DataFile/i.test(head)) return 'legacy';
  const r = rootStart(bytes);
  if (typeof r === 'number' && r >= 0 && isVtkFileTag(bytes, r)) return 'xml';
  if (/<VTKFile\b/.test(head)) return 'xml';
  return 'unknown';
}

/** Whether the tag at `at` is `<VTKFile` followed by a byte that ends a tag name. */
function isVtkFileTag(b: Uint8Array, at: number): boolean {
  const name = '<VTKFile';
  for (let k = 0; k < name.length; k++) if (b[at + k] !== name.charCodeAt(k)) return false;
  const next = b[at + name.length];
  return next === undefined || next === 32 || next === 10 || next === 13 || next === 9 || next === 62 || next === 47;
}

/** The `type` attribute of an XML file's root, e.g. `UnstructuredGrid`, `vtkMultiBlockDataSet`. */
export function xmlFileType(bytes: Uint8Array): string | undefined {
  const r = rootStart(bytes);
  const from = typeof r === 'number' && r >= 0 ? r : 0;
  const head = new TextDecoder('latin1').decode(bytes.subarray(from, Math.min(bytes.length, from + SNIFF_BYTES)));
  return /<VTKFile\b[^>]*\btype\s*=\s*["']([^"']+)["']/.exec(head)?.[1];
}

/** The file's first bytes, enough to pass its XML prolog (up to `MAX_PROLOG_BYTES`). */
async function readHead(src: ByteSource): Promise<Uint8Array> {
  let head = await src.read(0, SNIFF_BYTES);
  while (head.length < src.size && rootStart(head) === 'more' && head.length < MAX_PROLOG_BYTES) {
    head = await src.read(0, Math.min(MAX_PROLOG_BYTES, head.length * 4));
  }
  return head;
}

const SET_TYPES = new Set(['PUnstructuredGrid', 'PPolyData', 'vtkMultiBlockDataSet', 'vtkPartitionedDataSet', 'vtkPartitionedDataSetCollection']);

/**
 * Reads a VTK file (legacy `.vtk`, XML `.vtu`/`.vtp`) or set (`.pvtu`, `.vtm`, which need
 * `opts.resolveSource` or `opts.resolve`) from a source, reading only what it needs: the arrays of raw
 * appended XML and of binary legacy files are read one by one into their final arrays; files with inline
 * or text data are read whole, once. Errors start with `src.name`.
 */
export async function readDatasetFrom(src: ByteSource, opts: LoadOptions = {}): Promise<Dataset> {
  try {
    return await withMemoryBudget(opts.memoryLimit, opts.memoryHint, () => dispatch(src, opts));
  } catch (e) {
    throw asOneLineError(e, src.name);
  }
}

async function dispatch(src: ByteSource, opts: LoadOptions): Promise<Dataset> {
  const name = src.name;
  const head = await readHead(src);
  const format = sniffFormat(head);
  if (format === 'legacy') return readLegacyVtkFrom(src, name, opts);
  if (format === 'xml') {
    if (SET_TYPES.has(xmlFileType(head) ?? '')) return readVtkSet(name, await readWhole(src), opts);
    return readVtkXmlFrom(src, name, opts);
  }
  if (src.size === 0) throw new Error(`${name}: the file is empty; expected "# vtk DataFile" or "<VTKFile" at the start`);
  throw new Error(`${name}: not a VTK file (expected "# vtk DataFile" or "<VTKFile" at the start, found ${quoteBytes(head, 0, 40)})`);
}

/**
 * Reads a VTK file or set from its bytes (see `readDatasetFrom`). `name` is used in every error message.
 */
export async function readDataset(name: string, bytes: Uint8Array, opts: LoadOptions = {}): Promise<Dataset> {
  return readDatasetFrom(bytesSource(name, bytes), opts);
}
