/**
 * Writes a dataset as a VTK XML UnstructuredGrid file (`.vtu`, file version 1.0): one `<Piece>` per
 * piece, point data, cell data, dataset field data, polyhedra with `faces`/`faceoffsets`.
 *
 * Encodings (one per file):
 *  - `ascii`: `format="ascii"`, numbers as text (round-trip exact);
 *  - `base64`: `format="binary"`, inline base64, uncompressed;
 *  - `appended-raw`: `<AppendedData encoding="raw">`, uncompressed;
 *  - `appended-base64`: `<AppendedData encoding="base64">`, uncompressed;
 *  - `zlib`: appended raw, zlib-compressed in blocks (`compressor="vtkZLibDataCompressor"`);
 *  - `zlib-base64`: inline base64, zlib-compressed in blocks.
 * Binary blocks start with a header of `headerType` integers: the byte count (uncompressed), or
 * `[blocks, blockSize, lastPartialSize (0 when the last block is full), compressed sizes…]`.
 * As VTK does, the header and the data are base64-encoded as two separately padded runs.
 * Pure (no Node modules); the output is a byte array.
 */
import { zlibSync, type DeflateOptions } from 'fflate';
import { CellType } from '../model/cellTypes.ts';
import type { Dataset } from '../model/dataset.ts';
import type { FieldArray, NumericArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import { writeAsciiValues } from './asciiFormat.ts';
import { base64Encode } from './base64Encode.ts';
import { ByteSink, littleEndianBytes, widenIds } from './byteSink.ts';

export type VtuEncoding = 'ascii' | 'base64' | 'appended-raw' | 'appended-base64' | 'zlib' | 'zlib-base64';

export interface VtuWriteOptions {
  /** Default `zlib`. */
  encoding: VtuEncoding;
  /** Integer type of binary block headers. Default `UInt64`. */
  headerType: 'UInt32' | 'UInt64';
  /** Uncompressed bytes per zlib block. Default 32768. */
  blockSize: number;
  /** zlib level 0–9. Default 6. */
  level: number;
  /** Element type of connectivity, offsets, faces and faceoffsets. Default `Int64`. */
  idType: 'Int32' | 'Int64';
}

export const VTU_WRITE_DEFAULTS: Readonly<VtuWriteOptions> = {
  encoding: 'zlib', headerType: 'UInt64', blockSize: 32768, level: 6, idType: 'Int64',
};

/** An array about to be written: its XML element type, the values to print as text, and its bytes for binary. */
interface OutArray {
  name: string;
  type: string;
  components: number;
  /** Values as the text encodings print them. */
  values: NumericArray;
  /** Little-endian bytes of the values in `type` (made on demand: only binary encodings need them). */
  bytes: () => Uint8Array;
  /** For field data: the tuple count attribute. */
  tuples?: number;
}

const XML_TYPE = (v: NumericArray): string => {
  if (v instanceof Float64Array) return 'Float64';
  if (v instanceof Float32Array) return 'Float32';
  if (v instanceof Int32Array) return 'Int32';
  if (v instanceof Uint32Array) return 'UInt32';
  if (v instanceof Int16Array) return 'Int16';
  if (v instanceof Uint16Array) return 'UInt16';
  if (v instanceof Int8Array) return 'Int8';
  return 'UInt8';
};

const escapeAttr = (s: string): string => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

function fieldArray(f: FieldArray, tuples?: number): OutArray {
  return {
    name: f.name, type: XML_TYPE(f.values), components: f.components, values: f.values,
    bytes: () => littleEndianBytes(f.values), ...(tuples !== undefined ? { tuples } : {}),
  };
}

function idArray(name: string, ids: Int32Array, idType: VtuWriteOptions['idType']): OutArray {
  return {
    name, type: idType, components: 1, values: ids,
    bytes: () => littleEndianBytes(idType === 'Int64' ? widenIds(ids) : ids),
  };
}

/** The `faces` stream and `faceoffsets` of a piece with polyhedra, in the XML file's layout. */
function polyhedronArrays(p: Piece): { faces: Int32Array; faceOffsets: Int32Array } | undefined {
  const pf = p.polyFaces;
  if (!pf) return undefined;
  const n = p.cellTypes.length;
  let size = 0;
  for (let c = 0; c < n; c++) {
    if (p.cellTypes[c] !== CellType.POLYHEDRON) continue;
    size += 1;
    for (let f = pf.cellFaceStart[c]!; f < pf.cellFaceStart[c + 1]!; f++) size += 1 + pf.faceOffsets[f + 1]! - pf.faceOffsets[f]!;
  }
  const faces = new Int32Array(size), faceOffsets = new Int32Array(n);
  let o = 0;
  for (let c = 0; c < n; c++) {
    if (p.cellTypes[c] !== CellType.POLYHEDRON) { faceOffsets[c] = -1; continue; }
    const f0 = pf.cellFaceStart[c]!, f1 = pf.cellFaceStart[c + 1]!;
    faces[o++] = f1 - f0;
    for (let f = f0; f < f1; f++) {
      const a = pf.faceOffsets[f]!, b = pf.faceOffsets[f + 1]!;
      faces[o++] = b - a;
      for (let k = a; k < b; k++) faces[o++] = pf.faceConnectivity[k]!;
    }
    faceOffsets[c] = o;
  }
  return { faces, faceOffsets };
}

/** Header integers as little-endian bytes of the header type. */
function headerBytes(values: number[], headerType: VtuWriteOptions['headerType']): Uint8Array {
  if (headerType === 'UInt32') {
    for (const v of values) if (v > 0xffffffff) throw new Error(`writeVtu: block of ${v} bytes does not fit a UInt32 header; use headerType UInt64`);
    return littleEndianBytes(Uint32Array.from(values));
  }
  return littleEndianBytes(BigInt64Array.from(values, (v) => BigInt(v)));
}

/** Header and data of one binary block, uncompressed or zlib-compressed in blocks. */
function binaryBlock(data: Uint8Array, o: VtuWriteOptions, compressed: boolean): { header: Uint8Array; data: Uint8Array[] } {
  if (!compressed) return { header: headerBytes([data.length], o.headerType), data: [data] };
  const bs = o.blockSize, n = Math.ceil(data.length / bs);
  const blocks: Uint8Array[] = [];
  const sizes: number[] = [n, bs, data.length % bs];
  for (let b = 0; b < n; b++) {
    const z = zlibSync(data.subarray(b * bs, Math.min(data.length, (b + 1) * bs)), { level: o.level as DeflateOptions['level'] });
    blocks.push(z);
    sizes.push(z.length);
  }
  return { header: headerBytes(sizes, o.headerType), data: blocks };
}

function joined(parts: Uint8Array[]): Uint8Array {
  if (parts.length === 1) return parts[0]!;
  let n = 0;
  for (const p of parts) n += p.length;
  const out = new Uint8Array(n);
  n = 0;
  for (const p of parts) { out.set(p, n); n += p.length; }
  return out;
}

/** Writes `d` as a `.vtu` file. `d.kind` is not consulted: polygonal data is written as unstructured cells. */
export function writeVtu(d: Dataset, options: Partial<VtuWriteOptions> = {}): Uint8Array {
  const o: VtuWriteOptions = { ...VTU_WRITE_DEFAULTS, ...options };
  if (!Number.isInteger(o.blockSize) || o.blockSize < 1) throw new Error(`writeVtu: blockSize must be a positive integer, got ${o.blockSize}`);
  if (!Number.isInteger(o.level) || o.level < 0 || o.level > 9) throw new Error(`writeVtu: level must be an integer 0–9, got ${o.level}`);
  const enc = o.encoding;
  const compressed = enc === 'zlib' || enc === 'zlib-base64';
  const appended = enc === 'appended-raw' || enc === 'appended-base64' || enc === 'zlib';
  const appendedBase64 = enc === 'appended-base64';
  const sink = new ByteSink();
  const tail = new ByteSink();

  const writeArray = (a: OutArray, indent: string): void => {
    const head = `${indent}<DataArray type="${a.type}" Name="${escapeAttr(a.name)}"`
      + (a.components !== 1 ? ` NumberOfComponents="${a.components}"` : '')
      + (a.tuples !== undefined ? ` NumberOfTuples="${a.tuples}"` : '');
    if (enc === 'ascii') {
      sink.text(`${head} format="ascii">\n`);
      writeAsciiValues(sink, a.values, a.components === 3 ? 6 : 8, indent + '  ');
      sink.text(`${indent}</DataArray>\n`);
      return;
    }
    const block = binaryBlock(a.bytes(), o, compressed);
    if (appended) {
      sink.text(`${head} format="appended" offset="${tail.size}"/>\n`);
      if (appendedBase64) {
        tail.bytes(base64Encode(block.header));
        tail.bytes(base64Encode(joined(block.data)));
      } else {
        tail.bytes(block.header);
        for (const b of block.data) tail.bytes(b);
      }
      return;
    }
    sink.text(`${head} format="binary">\n${indent}  `);
    sink.bytes(base64Encode(block.header));
    sink.bytes(base64Encode(joined(block.data)));
    sink.text(`\n${indent}</DataArray>\n`);
  };

  sink.text(`<?xml version="1.0"?>\n<VTKFile type="UnstructuredGrid" version="1.0" byte_order="LittleEndian" header_type="${o.headerType}"`
    + (compressed ? ' compressor="vtkZLibDataCompressor"' : '') + '>\n  <UnstructuredGrid>\n');
  if (d.fieldData.length > 0) {
    sink.text('    <FieldData>\n');
    for (const f of d.fieldData) writeArray(fieldArray(f, f.values.length / f.components), '      ');
    sink.text('    </FieldData>\n');
  }
  for (const p of d.pieces) {
    const nCells = p.cellTypes.length;
    sink.text(`    <Piece NumberOfPoints="${p.points.length / 3}" NumberOfCells="${nCells}">\n`);
    for (const [tag, list] of [['PointData', p.pointData], ['CellData', p.cellData]] as const) {
      if (list.length === 0) { sink.text(`      <${tag}/>\n`); continue; }
      sink.text(`      <${tag}>\n`);
      for (const f of list) writeArray(fieldArray(f), '        ');
      sink.text(`      </${tag}>\n`);
    }
    sink.text('      <Points>\n');
    writeArray({ name: 'Points', type: 'Float64', components: 3, values: p.points, bytes: () => littleEndianBytes(p.points) }, '        ');
    sink.text('      </Points>\n      <Cells>\n');
    writeArray(idArray('connectivity', p.connectivity, o.idType), '        ');
    writeArray(idArray('offsets', p.offsets.subarray(1), o.idType), '        ');
    writeArray({ name: 'types', type: 'UInt8', components: 1, values: p.cellTypes, bytes: () => littleEndianBytes(p.cellTypes) }, '        ');
    const poly = polyhedronArrays(p);
    if (poly) {
      writeArray(idArray('faces', poly.faces, o.idType), '        ');
      writeArray(idArray('faceoffsets', poly.faceOffsets, o.idType), '        ');
    }
    sink.text('      </Cells>\n    </Piece>\n');
  }
  sink.text('  </UnstructuredGrid>\n');
  if (appended) {
    sink.text(`  <AppendedData encoding="${appendedBase64 ? 'base64' : 'raw'}">\n   _`);
    sink.drain(tail);
    sink.text('\n  </AppendedData>\n');
  }
  sink.text('</VTKFile>\n');
  return sink.finish();
}
