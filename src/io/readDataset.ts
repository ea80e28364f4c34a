/**
 * One entry point for every supported file: picks the reader from the file's first bytes (falling
 * back to its extension for the message) and returns the dataset. Runs in the worker, the CLI and tests.
 */
import type { Dataset } from '../model/dataset.ts';
import type { LoadOptions } from './loadOptions.ts';
import { readLegacyVtk } from './vtkLegacy.ts';
import { readVtkSet } from './vtkSets.ts';
import { readVtkXml } from './vtkXml.ts';

/** The kinds of input this reader dispatch knows. */
export type InputFormat = 'legacy' | 'xml' | 'unknown';

/** Looks at the first bytes: legacy files start with `# vtk DataFile`, XML files have `<VTKFile` near the top. */
export function sniffFormat(bytes: Uint8Array): InputFormat {
  const head = new TextDecoder('latin1').decode(bytes.subarray(0, Math.min(bytes.length, 1024)));
  if (/^\s*# vtk DataFile/i.test(head)) return 'legacy';
  if (/<VTKFile\b/.test(head)) return 'xml';
  return 'unknown';
}

/** The `type` attribute of an XML file's root, e.g. `UnstructuredGrid`, `vtkMultiBlockDataSet`. */
export function xmlFileType(bytes: Uint8Array): string | undefined {
  const head = new TextDecoder('latin1').decode(bytes.subarray(0, Math.min(bytes.length, 4096)));
  return /<VTKFile\b[^>]*\btype\s*=\s*["']([^"']+)["']/.exec(head)?.[1];
}

/**
 * Reads a VTK file (legacy `.vtk`, XML `.vtu`/`.vtp`) or set (`.pvtu`, `.vtm`, which need `opts.resolve`).
 * `name` is used in every error message.
 */
export async function readDataset(name: string, bytes: Uint8Array, opts: LoadOptions = {}): Promise<Dataset> {
  const format = sniffFormat(bytes);
  if (format === 'legacy') return readLegacyVtk(name, bytes, opts);
  if (format === 'xml') {
    const type = xmlFileType(bytes);
    if (type === 'PUnstructuredGrid' || type === 'PPolyData' || type === 'vtkMultiBlockDataSet'
      || type === 'vtkPartitionedDataSet' || type === 'vtkPartitionedDataSetCollection') return readVtkSet(name, bytes, opts);
    return readVtkXml(name, bytes, opts);
  }
  const start = new TextDecoder('latin1').decode(bytes.subarray(0, 40)).replace(/[^\x20-\x7e]/g, '?');
  throw new Error(`${name}: not a VTK file (expected "# vtk DataFile" or "<VTKFile" at the start, found "${start}")`);
}
