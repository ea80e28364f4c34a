/**
 * The dataset-level field data of a result file without its mesh or fields, for a quick pass over a
 * series to find each step's `TimeValue`. A single XML file is scanned for its structure (for appended
 * data only the XML head is read) and only its `<FieldData>` arrays are decoded; legacy files and sets
 * (`.pvtu`, `.vtm`) are read whole through `readDatasetFrom`, since their field data may sit anywhere.
 */
import type { FieldArray } from '../model/fieldArray.ts';
import type { ByteSource } from './byteSource.ts';
import { Checkpoint, type LoadOptions } from './loadOptions.ts';
import { readDatasetFrom, sniffFormat, xmlFileType } from './readDataset.ts';
import { appendedOffsets, type XmlFileContext } from './xmlArrays.ts';
import { fflateInflate } from './xmlBlocks.ts';
import { readFieldData } from './xmlFields.ts';
import { scanXmlSource } from './xmlHead.ts';
import { child } from './xmlScan.ts';
import { fileSettings } from './vtkXml.ts';

const SINGLE_XML = new Set(['UnstructuredGrid', 'PolyData']);

/** Field data (association 'dataset') of the file behind `src`; errors start with `src.name`. */
export async function readFieldDataOnly(src: ByteSource, opts: LoadOptions = {}): Promise<FieldArray[]> {
  const name = src.name;
  const head = await src.read(0, Math.min(src.size, 4096));
  if (sniffFormat(head) !== 'xml' || !SINGLE_XML.has(xmlFileType(head) ?? '')) return [...(await readDatasetFrom(src, opts)).fieldData];
  const input = await scanXmlSource(src, name, new Checkpoint(name, opts, src.size));
  const s = fileSettings(input.doc, name);
  const dataEl = child(input.doc.root, s.type);
  if (!dataEl) throw new Error(`${name}: <VTKFile type="${s.type}"> has no <${s.type}> element`);
  const ctx: XmlFileContext = {
    name, bytes: input.bytes, wholeFile: input.whole, source: input.source, inflate: opts.inflate ?? fflateInflate,
    appendedOffsets: input.whole ? [] : appendedOffsets(input.doc.root).sort((a, b) => a - b),
    littleEndian: s.littleEndian, headerType: s.headerType, compressor: s.compressor,
    appended: input.doc.appended, cp: new Checkpoint(name, opts, src.size), warnings: [],
  };
  return readFieldData(ctx, child(dataEl, 'FieldData'), name);
}
