/**
 * Test helper: one dataset written by our writers in every encoding (`writeVtu`: six encodings × two
 * header types × two id types, odd zlib block sizes among them; `writeLegacyVtk`: binary and text,
 * versions 4.2 and 5.1), large enough that its arrays span several of the readers' scratch chunks.
 */
import { writeLegacyVtk } from '../../src/io/writeLegacy.ts';
import { writeVtu, type VtuEncoding } from '../../src/io/writeVtu.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { FieldArray, NumericArray } from '../../src/model/fieldArray.ts';
import { datasetOf, hexGrid, tetGrid, withFields } from '../../src/model/meshBuild.ts';

/** A hexahedral and a tetrahedral piece with fields of several element types; big enough for several scratch chunks. */
export function writtenDataset(n = 24): Dataset {
  const typed = (name: string, values: NumericArray, components: number, association: 'point' | 'cell'): FieldArray =>
    ({ name, association, components, values, sourceType: values.constructor.name.replace('Array', '').replace('Uint', 'UInt') });
  const hex = hexGrid(n, n, n, (u, v, w) => [u * 2 - 0.5, v * v, Math.sin(w)]);
  const np = hex.points.length / 3, nc = hex.cellTypes.length;
  const a = withFields(hex, [
    typed('velocity', new Float32Array(3 * np).map((_, i) => Math.fround(Math.cos(i) * 1e3)), 3, 'point'),
    typed('p', new Float64Array(np).map((_, i) => (i % 7 === 0 ? -0 : i / 3)), 1, 'point'),
    typed('mark', Int16Array.from({ length: np }, (_, i) => (i * 37) % 65535 - 32768), 1, 'point'),
  ], [
    typed('zone', Int32Array.from({ length: nc }, (_, i) => i % 5 - 2), 1, 'cell'),
    typed('flag', Uint8Array.from({ length: nc }, (_, i) => i & 255), 1, 'cell'),
    typed('w', Uint32Array.from({ length: nc }, (_, i) => 4294967295 - i), 1, 'cell'),
  ]);
  const tet = tetGrid(6, 5, 4);
  const b = withFields(tet, [typed('velocity', new Float32Array(tet.points.length), 3, 'point'), typed('p', new Float64Array(tet.points.length / 3).fill(2.5), 1, 'point'),
    typed('mark', new Int16Array(tet.points.length / 3), 1, 'point')], [typed('zone', new Int32Array(tet.cellTypes.length), 1, 'cell'),
    typed('flag', new Uint8Array(tet.cellTypes.length), 1, 'cell'), typed('w', new Uint32Array(tet.cellTypes.length), 1, 'cell')]);
  return { ...datasetOf([a, b], 'written'), fieldData: [{ ...typed('TimeValue', Float64Array.of(12.5), 1, 'point'), association: 'dataset' }] };
}

const ENCODINGS: VtuEncoding[] = ['ascii', 'base64', 'appended-raw', 'appended-base64', 'zlib', 'zlib-base64'];

/** Every writer variant of `writtenDataset`: name → bytes. */
export function writtenFiles(d: Dataset): [string, Uint8Array][] {
  const out: [string, Uint8Array][] = [];
  for (const encoding of ENCODINGS) {
    for (const headerType of ['UInt32', 'UInt64'] as const) {
      for (const idType of ['Int32', 'Int64'] as const) {
        // Odd zlib blocks end inside elements.
        out.push([`w-${encoding}-${headerType}-${idType}.vtu`, writeVtu(d, { encoding, headerType, idType, blockSize: encoding.startsWith('zlib') && idType === 'Int64' ? 20001 : 32768 })]);
      }
    }
  }
  for (const binary of [true, false]) {
    for (const version of ['4.2', '5.1'] as const) {
      const one = { ...d, pieces: d.pieces.slice(0, 1) };
      out.push([`w-${binary ? 'binary' : 'ascii'}-${version}.vtk`, writeLegacyVtk(one, { binary, version })]);
    }
  }
  return out;
}


const latin1 = (b: Uint8Array) => Buffer.from(b).toString('latin1');

/**
 * Turns a file with raw appended data (from `writeVtu`, `appended-raw` or `zlib`) into the layout VTK's
 * XML writers use by default: base64 appended data, each array's header and data encoded as two
 * separately padded base64 runs, offsets counted in characters.
 */
export function toBase64Appended(file: Uint8Array): Uint8Array {
  const s = latin1(file);
  const tag = s.indexOf('<AppendedData');
  const start = s.indexOf('_', tag) + 1;
  const end = s.lastIndexOf('</AppendedData>');
  const head = s.slice(0, tag);
  const long = /header_type="UInt64"/.test(head), zlib = /compressor="vtkZLibDataCompressor"/.test(head);
  const hs = long ? 8 : 4;
  const offsets = [...head.matchAll(/offset="(\d+)"/g)].map((m) => Number(m[1]));
  const sorted = [...new Set(offsets)].sort((a, b) => a - b);
  const data = file.subarray(start, end);
  const dv = new DataView(data.buffer, data.byteOffset, data.byteLength);
  const word = (at: number) => (long ? Number(dv.getBigUint64(at, true)) : dv.getUint32(at, true));
  const moved = new Map<number, number>();
  let text = '';
  for (let i = 0; i < sorted.length; i++) {
    const a = sorted[i]!, b = i + 1 < sorted.length ? sorted[i + 1]! : data.length;
    const headerBytes = zlib ? (3 + word(a)) * hs : hs;
    moved.set(a, text.length);
    text += Buffer.from(data.subarray(a, a + headerBytes)).toString('base64') + Buffer.from(data.subarray(a + headerBytes, b)).toString('base64');
  }
  const newHead = head.replace(/offset="(\d+)"/g, (_, o: string) => `offset="${moved.get(Number(o))}"`);
  return new Uint8Array(Buffer.from(`${newHead}<AppendedData encoding="base64">\n   _${text}\n  </AppendedData>\n</VTKFile>\n`, 'latin1'));
}
