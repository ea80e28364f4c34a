/**
 * Reader for VTK XML UnstructuredGrid (`.vtu`) and PolyData (`.vtp`) files.
 *
 * Supported: `format` ascii, binary (inline base64) and appended (raw or base64); `header_type` UInt32
 * (the default) or UInt64 on any file version; LittleEndian and BigEndian; zlib compression with
 * multi-block headers; every numeric type Int8 … Float64; several `<Piece>` elements (one model piece
 * each); polyhedra in both VTK layouts; higher-order cells by their corners; dataset `<FieldData>`.
 * Refused with a clear message: other compressors (LZMA, LZ4) and structured dataset types.
 */
import type { Dataset, DatasetKind } from '../model/dataset.ts';
import type { Piece } from '../model/piece.ts';
import { bytesSource, type ByteSource } from './byteSource.ts';
import { Checkpoint, type LoadOptions } from './loadOptions.ts';
import { appendedOffsets, type XmlFileContext } from './xmlArrays.ts';
import { fflateInflate } from './xmlBlocks.ts';
import { readFieldData } from './xmlFields.ts';
import { readFieldStrings } from './xmlStrings.ts';
import { scanXmlSource, type XmlInput } from './xmlHead.ts';
import { readXmlPiece } from './xmlPiece.ts';
import { child, childrenNamed, type XmlDocument } from './xmlScan.ts';
import { checkElementNames } from './xmlVocabulary.ts';

const STRUCTURED = new Set(['ImageData', 'RectilinearGrid', 'StructuredGrid', 'PImageData', 'PRectilinearGrid', 'PStructuredGrid']);

/** The message for a file type fieldtally does not read. */
export function unsupportedTypeError(name: string, type: string): Error {
  if (STRUCTURED.has(type)) {
    return new Error(`${name}: VTK XML "${type}" (a structured grid type) is not supported; fieldtally reads UnstructuredGrid (.vtu) and PolyData (.vtp) files and their sets (.pvtu, .pvtp, .vtm) — convert the data to an unstructured grid first`);
  }
  return new Error(`${name}: VTK XML type "${type}" is not supported; fieldtally reads UnstructuredGrid (.vtu) and PolyData (.vtp) files and their sets (.pvtu, .pvtp, .vtm)`);
}

/** The `<VTKFile>` root's attributes, checked: dataset type, byte order, header type, compressor. */
export function fileSettings(doc: XmlDocument, name: string) {
  const root = doc.root;
  if (root.name !== 'VTKFile') throw new Error(`${name}: the root element is <${root.name}>, expected <VTKFile> (not a VTK XML file)`);
  const type = root.attrs.get('type');
  if (!type) throw new Error(`${name}: <VTKFile> has no type attribute`);
  const order = root.attrs.get('byte_order') ?? 'LittleEndian';
  if (order !== 'LittleEndian' && order !== 'BigEndian') throw new Error(`${name}: byte_order="${order}" is not LittleEndian or BigEndian`);
  const headerType = root.attrs.get('header_type') ?? 'UInt32';
  if (headerType !== 'UInt32' && headerType !== 'UInt64') throw new Error(`${name}: header_type="${headerType}" is not UInt32 or UInt64`);
  const compressor = root.attrs.get('compressor') || undefined;
  const body = child(root, type);
  if (body) checkElementNames(body, name);
  return { type, littleEndian: order === 'LittleEndian', headerType: headerType as 'UInt32' | 'UInt64', compressor };
}

/** Reads an already scanned XML file (used by the set reader to avoid a second scan). */
export async function readVtkXmlInput(name: string, input: XmlInput, opts: LoadOptions = {}): Promise<Dataset> {
  const { doc, bytes, source, whole } = input;
  const s = fileSettings(doc, name);
  let kind: DatasetKind;
  if (s.type === 'UnstructuredGrid') kind = 'unstructured';
  else if (s.type === 'PolyData') kind = 'polydata';
  else throw unsupportedTypeError(name, s.type);
  const dataEl = child(doc.root, s.type);
  if (!dataEl) throw new Error(`${name}: <VTKFile type="${s.type}"> has no <${s.type}> element`);
  const warnings: string[] = [];
  const ctx: XmlFileContext = {
    name, bytes, wholeFile: whole, source, inflate: opts.inflate ?? fflateInflate,
    appendedOffsets: whole ? [] : appendedOffsets(doc.root).sort((a, b) => a - b),
    littleEndian: s.littleEndian, headerType: s.headerType, compressor: s.compressor,
    appended: doc.appended, cp: new Checkpoint(name, opts, source.size), warnings, parseText: opts.parseText, decodeBase64: opts.decodeBase64, readParts: opts.readParts, sharedArrays: opts.sharedArrays,
  };
  const fieldData = await readFieldData(ctx, child(dataEl, 'FieldData'), name);
  const fieldStrings = await readFieldStrings(ctx, child(dataEl, 'FieldData'), name);
  const pieces: Piece[] = [];
  const fileCellTypes: Record<number, number> = {};
  const pieceEls = childrenNamed(dataEl, 'Piece');
  for (let k = 0; k < pieceEls.length; k++) {
    const before = opts.geometryBefore?.kind === kind ? opts.geometryBefore.pieces[k] : undefined;
    const r = await readXmlPiece(ctx, pieceEls[k]!, kind, k, before);
    pieces.push(r.piece);
    for (const [t, n] of Object.entries(r.fileCellTypes)) fileCellTypes[Number(t)] = (fileCellTypes[Number(t)] ?? 0) + n;
    warnings.push(...(pieceEls.length > 1 ? r.warnings : r.warnings.map((w) => w.replace(/^piece 0: /, ''))));
  }
  if (pieces.length === 0) warnings.push('the file holds no <Piece> (empty dataset)');
  return { source: name, kind, pieces, fieldData, warnings, fileCellTypes, ...(fieldStrings.length ? { fieldStrings } : {}) };
}

/**
 * Reads a VTK XML UnstructuredGrid or PolyData file from a source: a file whose arrays are all appended
 * data is read array by array (never whole); one with inline data is streamed once for its structure, then
 * read array by array; one with both is read whole, once. `name` starts every
 * error message; `opts` gives progress, cancellation and the inflater. Coordinates and fields are in the
 * file's units.
 */
export async function readVtkXmlFrom(src: ByteSource, name: string = src.name, opts: LoadOptions = {}): Promise<Dataset> {
  return readVtkXmlInput(name, await scanXmlSource(src, name, new Checkpoint(name, opts, src.size)), opts);
}

/** Reads a VTK XML UnstructuredGrid or PolyData file from its bytes (see `readVtkXmlFrom`). */
export async function readVtkXml(name: string, bytes: Uint8Array, opts: LoadOptions = {}): Promise<Dataset> {
  return readVtkXmlFrom(bytesSource(name, bytes), name, opts);
}
