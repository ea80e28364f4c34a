/**
 * One entry point for every supported file: picks the reader from the file's first bytes (falling
 * back to its extension for the message) and returns the dataset. Runs in the worker, the CLI and tests.
 */
import type { Dataset } from '../model/dataset.ts';
import { bytesSource, type ByteSource } from './byteSource.ts';
import { readWhole } from './sourceArrays.ts';
import type { LoadOptions } from './loadOptions.ts';
import { readLegacyVtkFrom } from './vtkLegacy.ts';
import { readVtkSet } from './vtkSets.ts';
import { readVtkXmlFrom } from './vtkXml.ts';

/** The kinds of input this reader dispatch knows. */
export type InputFormat = 'legacy' | 'xml' | 'unknown';

/** Bytes read to tell the format and the XML root's type. */
const SNIFF_BYTES = 4096;

/** Looks at the first bytes: legacy files start with `# vtk DataFile`, XML files have `<VTKFile` near the top. */
export function sniffFormat(bytes: Uint8Array): InputFormat {
  const head = new TextDecoder('latin1').decode(bytes.subarray(0, Math.min(bytes.length, 1024)));
  if (/^\s*# vtk DataFile/i.test(head)) return 'legacy';
  if (/<VTKFile\b/.test(head)) return 'xml';
  return 'unknown';
}

/** The `type` attribute of an XML file's root, e.g. `UnstructuredGrid`, `vtkMultiBlockDataSet`. */
export function xmlFileType(bytes: Uint8Array): string | undefined {
  const head = new TextDecoder('latin1').decode(bytes.subarray(0, Math.min(bytes.length, SNIFF_BYTES)));
  return /<VTKFile\b[^>]*\btype\s*=\s*["']([^"']+)["']/.exec(head)?.[1];
}

const SET_TYPES = new Set(['PUnstructuredGrid', 'PPolyData', 'vtkMultiBlockDataSet', 'vtkPartitionedDataSet', 'vtkPartitionedDataSetCollection']);

/**
 * Reads a VTK file (legacy `.vtk`, XML `.vtu`/`.vtp`) or set (`.pvtu`, `.vtm`, which need
 * `opts.resolveSource` or `opts.resolve`) from a source, reading only what it needs: the arrays of raw
 * appended XML and of binary legacy files are read one by one into their final arrays; files with inline
 * or text data are read whole, once. Errors start with `src.name`.
 */
export async function readDatasetFrom(src: ByteSource, opts: LoadOptions = {}): Promise<Dataset> {
  const name = src.name;
  const head = await src.read(0, SNIFF_BYTES);
  const format = sniffFormat(head);
  if (format === 'legacy') return readLegacyVtkFrom(src, name, opts);
  if (format === 'xml') {
    if (SET_TYPES.has(xmlFileType(head) ?? '')) return readVtkSet(name, await readWhole(src), opts);
    return readVtkXmlFrom(src, name, opts);
  }
  const start = new TextDecoder('latin1').decode(head.subarray(0, 40)).replace(/[^\x20-\x7e]/g, '?');
  throw new Error(`${name}: not a VTK file (expected "# vtk DataFile" or "<VTKFile" at the start, found "${start}")`);
}

/**
 * Reads a VTK file or set from its bytes (see `readDatasetFrom`). `name` is used in every error message.
 */
export async function readDataset(name: string, bytes: Uint8Array, opts: LoadOptions = {}): Promise<Dataset> {
  return readDatasetFrom(bytesSource(name, bytes), opts);
}
