/**
 * Writes a one-piece dataset as a legacy VTK file (`# vtk DataFile Version 4.2` or `5.1`),
 * `DATASET UNSTRUCTURED_GRID`, ASCII or big-endian binary.
 *
 * Layout: dataset field data (`FIELD FieldData`), `POINTS … double`, cells (4.2: `CELLS n size` with a
 * count before each cell; 5.1: `CELLS n+1 size` then `OFFSETS`/`CONNECTIVITY vtktypeint64`), `CELL_TYPES`,
 * then `POINT_DATA`/`CELL_DATA`: the first one-component array as `SCALARS` (with `LOOKUP_TABLE default`),
 * the first three-component array as `VECTORS`, every other array in one `FIELD FieldData` block.
 * A polyhedron's cell entry is its face stream `[faces, n0, ids…, n1, ids…]`, as VTK writes it.
 * Spaces in array names become `%20`. Pure (no Node modules).
 */
import { CellType } from '../model/cellTypes.ts';
import type { Dataset } from '../model/dataset.ts';
import type { FieldArray, NumericArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import { writeAsciiValues } from './asciiFormat.ts';
import { bigEndianBytes, ByteSink, widenIds } from './byteSink.ts';

export interface LegacyWriteOptions {
  /** Big-endian binary (`BINARY`) or text (`ASCII`). Default true. */
  binary: boolean;
  /** File version: `4.2` (classic cell list) or `5.1` (offsets + connectivity). Default `5.1`. */
  version: '4.2' | '5.1';
  /** Second line of the file (one line, at most 255 characters). Default `fieldtally dataset`. */
  title: string;
}

export const LEGACY_WRITE_DEFAULTS: Readonly<LegacyWriteOptions> = { binary: true, version: '5.1', title: 'fieldtally dataset' };

const LEGACY_TYPE = (v: NumericArray): string => {
  if (v instanceof Float64Array) return 'double';
  if (v instanceof Float32Array) return 'float';
  if (v instanceof Int32Array) return 'int';
  if (v instanceof Uint32Array) return 'unsigned_int';
  if (v instanceof Int16Array) return 'short';
  if (v instanceof Uint16Array) return 'unsigned_short';
  if (v instanceof Int8Array) return 'char';
  return 'unsigned_char';
};

const legacyName = (s: string): string => s.replace(/%/g, '%25').replace(/ /g, '%20');

/**
 * Cell lists in the legacy layout: `offsets` (n+1) and `connectivity`, where a polyhedron's entry is
 * its face stream instead of its point list.
 */
function legacyCells(p: Piece): { offsets: Int32Array; connectivity: Int32Array } {
  const pf = p.polyFaces;
  if (!pf) return { offsets: p.offsets, connectivity: p.connectivity };
  const n = p.cellTypes.length, offsets = new Int32Array(n + 1);
  for (let c = 0; c < n; c++) {
    let len = p.offsets[c + 1]! - p.offsets[c]!;
    if (p.cellTypes[c] === CellType.POLYHEDRON) {
      len = 1;
      for (let f = pf.cellFaceStart[c]!; f < pf.cellFaceStart[c + 1]!; f++) len += 1 + pf.faceOffsets[f + 1]! - pf.faceOffsets[f]!;
    }
    offsets[c + 1] = offsets[c]! + len;
  }
  const conn = new Int32Array(offsets[n]!);
  for (let c = 0; c < n; c++) {
    let o = offsets[c]!;
    if (p.cellTypes[c] !== CellType.POLYHEDRON) { conn.set(p.connectivity.subarray(p.offsets[c]!, p.offsets[c + 1]!), o); continue; }
    const f0 = pf.cellFaceStart[c]!, f1 = pf.cellFaceStart[c + 1]!;
    conn[o++] = f1 - f0;
    for (let f = f0; f < f1; f++) {
      const a = pf.faceOffsets[f]!, b = pf.faceOffsets[f + 1]!;
      conn[o++] = b - a;
      for (let k = a; k < b; k++) conn[o++] = pf.faceConnectivity[k]!;
    }
  }
  return { offsets, connectivity: conn };
}

/** Cells in the 4.2 layout: each cell's node count followed by its nodes. */
function countedCells(offsets: Int32Array, connectivity: Int32Array): Int32Array {
  const n = offsets.length - 1, out = new Int32Array(n + connectivity.length);
  let o = 0;
  for (let c = 0; c < n; c++) {
    const a = offsets[c]!, b = offsets[c + 1]!;
    out[o++] = b - a;
    for (let k = a; k < b; k++) out[o++] = connectivity[k]!;
  }
  return out;
}

/** Writes `d` (exactly one piece) as a legacy `.vtk` file. */
export function writeLegacyVtk(d: Dataset, options: Partial<LegacyWriteOptions> = {}): Uint8Array {
  const o: LegacyWriteOptions = { ...LEGACY_WRITE_DEFAULTS, ...options };
  if (d.pieces.length !== 1) throw new Error(`writeLegacyVtk: ${d.source} has ${d.pieces.length} pieces, a legacy file holds exactly 1`);
  if (/[\r\n]/.test(o.title) || o.title.length > 255) throw new Error('writeLegacyVtk: title must be one line of at most 255 characters');
  const p = d.pieces[0]!;
  const sink = new ByteSink();

  const values = (v: NumericArray | BigInt64Array, ascii: NumericArray, perLine: number): void => {
    if (o.binary) { sink.bytes(bigEndianBytes(v)); sink.text('\n'); } else writeAsciiValues(sink, ascii, perLine, '');
  };
  const fieldBlock = (list: readonly FieldArray[]): void => {
    sink.text(`FIELD FieldData ${list.length}\n`);
    for (const f of list) {
      sink.text(`${legacyName(f.name)} ${f.components} ${f.values.length / f.components} ${LEGACY_TYPE(f.values)}\n`);
      values(f.values, f.values, Math.max(f.components, 6));
    }
  };
  const attributes = (list: readonly FieldArray[]): void => {
    const scalar = list.find((f) => f.components === 1);
    const vector = list.find((f) => f.components === 3);
    if (scalar) {
      sink.text(`SCALARS ${legacyName(scalar.name)} ${LEGACY_TYPE(scalar.values)} 1\nLOOKUP_TABLE default\n`);
      values(scalar.values, scalar.values, 9);
    }
    if (vector) {
      sink.text(`VECTORS ${legacyName(vector.name)} ${LEGACY_TYPE(vector.values)}\n`);
      values(vector.values, vector.values, 9);
    }
    const rest = list.filter((f) => f !== scalar && f !== vector);
    if (rest.length > 0) fieldBlock(rest);
  };

  sink.text(`# vtk DataFile Version ${o.version}\n${o.title}\n${o.binary ? 'BINARY' : 'ASCII'}\nDATASET UNSTRUCTURED_GRID\n`);
  if (d.fieldData.length > 0) fieldBlock(d.fieldData);
  const nPts = p.points.length / 3, nCells = p.cellTypes.length;
  sink.text(`POINTS ${nPts} double\n`);
  values(p.points, p.points, 9);
  const { offsets, connectivity } = legacyCells(p);
  if (o.version === '4.2') {
    const counted = countedCells(offsets, connectivity);
    sink.text(`CELLS ${nCells} ${counted.length}\n`);
    if (o.binary) values(counted, counted, 1);
    else writeCellLines(sink, offsets, connectivity);
  } else {
    sink.text(`CELLS ${nCells + 1} ${connectivity.length}\nOFFSETS vtktypeint64\n`);
    values(widenIds(offsets), offsets, 9);
    sink.text('CONNECTIVITY vtktypeint64\n');
    values(widenIds(connectivity), connectivity, 9);
  }
  sink.text(`CELL_TYPES ${nCells}\n`);
  const types = Int32Array.from(p.cellTypes);
  values(types, types, 9);
  if (p.pointData.length > 0) { sink.text(`POINT_DATA ${nPts}\n`); attributes(p.pointData); }
  if (p.cellData.length > 0) { sink.text(`CELL_DATA ${nCells}\n`); attributes(p.cellData); }
  return sink.finish();
}

/** ASCII 4.2 cells: one line per cell, `count id id …`. */
function writeCellLines(sink: ByteSink, offsets: Int32Array, connectivity: Int32Array): void {
  const n = offsets.length - 1, chunk = 1 << 14;
  for (let start = 0; start < n; start += chunk) {
    let s = '';
    for (let c = start, end = Math.min(n, start + chunk); c < end; c++) {
      const a = offsets[c]!, b = offsets[c + 1]!;
      s += b - a;
      for (let k = a; k < b; k++) s += ' ' + connectivity[k]!;
      s += '\n';
    }
    sink.text(s);
  }
}
