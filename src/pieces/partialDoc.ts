/**
 * The partial-results document one task of `fieldtally partial` writes and `fieldtally reduce` reads: JSON,
 * `"format": "fieldtally-partial-results"`, version 1. It holds
 *  - `set`: the piece set's identity (the path as given, its file name, the set file's SHA-256, the number of
 *    leaf files) and `task`: this task's number, the number of tasks and its share of the leaf files;
 *  - `probeSet`: the probe set's text, name and SHA-256 (every task must have evaluated the same set),
 *    and `units`, the set's unit declaration (numbers in the report are SI as that declares);
 *  - `inputs`: the files the task read (set files and its pieces), with size, SHA-256 and their place in
 *    the whole set's reading order, for the report's list of inputs;
 *  - `dataset`: the task's bounds, dataset kind, cell types as declared, field data and reader warnings;
 *  - `pieces`: per piece of the task's share, in order, the cells the probes need (`footprint.ts`) with their
 *    points and every field, and the keys of the faces that were boundary faces of the task's pieces.
 * Typed arrays are stored as `{ "type": "Float64Array", "base64": "…" }` (little-endian bytes).
 * Pure: the command line reads and writes the text.
 */
import { base64Encode } from '../io/base64Encode.ts';
import { decodeBase64 } from '../io/base64.ts';
import type { FieldArray, FieldRole, NumericArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import type { UnitsDoc } from '../study/probeSet.ts';
import type { InputFileInfo } from '../study/reportHtml.ts';

export const PARTIAL_FORMAT = 'fieldtally-partial-results';
export const PARTIAL_VERSION = 1;

/** A typed array in the document. */
export interface EncodedArray { type: string; base64: string }

export interface EncodedField {
  name: string;
  association: 'point' | 'cell' | 'dataset';
  components: number;
  sourceType: string;
  role?: FieldRole;
  values: EncodedArray;
}

export interface EncodedPiece {
  /** Cells of the piece as read, and how many the probes need (kept here). */
  cellsRead: number;
  cellsKept: number;
  points: EncodedArray;
  cellTypes: EncodedArray;
  offsets: EncodedArray;
  connectivity: EncodedArray;
  polyFaces?: { cellFaceStart: EncodedArray; faceOffsets: EncodedArray; faceConnectivity: EncodedArray };
  pointData: EncodedField[];
  cellData: EncodedField[];
  /** Ascending keys `localCell × 65536 + localFace` (kept-cell numbering) of the task's boundary faces. */
  boundary: EncodedArray;
}

/** One input file and its place in the whole set's reading order (`order`: 2 × leaf for a set file read before that leaf, 2 × leaf + 1 for the leaf). */
export interface OrderedInput extends InputFileInfo { order: number }

export interface PartialDoc {
  format: typeof PARTIAL_FORMAT;
  version: number;
  tool: { name: string; version: string };
  createdAt: string;
  set: { file: string; source: string; sha256: string; leaves: number };
  task: { index: number; count: number; firstLeaf: number; endLeaf: number };
  probeSet: { name: string; sha256: string; bytes: number; role: string; fromVersion: number; text: string };
  units: UnitsDoc | null;
  inputs: OrderedInput[];
  dataset: {
    kind: 'unstructured' | 'polydata' | 'none';
    /** `[xmin, xmax, ymin, ymax, zmin, zmax]` of the task's points; null when it read none. */
    bounds: number[] | null;
    fileCellTypes: Record<string, number>;
    fieldData: EncodedField[];
    warnings: string[];
  };
  pieces: EncodedPiece[];
}

/** The leaf files `[first, end)` of task `index` of `count` over `leaves` leaves: contiguous shares in file order, sizes differing by at most one. */
export function taskShare(index: number, count: number, leaves: number): { firstLeaf: number; endLeaf: number } {
  return { firstLeaf: Math.floor((index * leaves) / count), endLeaf: Math.floor(((index + 1) * leaves) / count) };
}

const CTORS: Record<string, new (b: ArrayBuffer) => NumericArray> = {
  Float64Array, Float32Array, Int32Array, Uint32Array, Int16Array, Uint16Array, Int8Array, Uint8Array,
};

const latin1 = new TextDecoder('latin1');

/** A typed array as document text. */
export function encodeArray(a: NumericArray): EncodedArray {
  const bytes = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  return { type: a.constructor.name, base64: latin1.decode(base64Encode(bytes)) };
}

/** A document array back as a typed array; `where` names it in errors. */
export function decodeArray(e: unknown, where: string, expect?: string): NumericArray {
  const x = e as Partial<EncodedArray> | null;
  if (!x || typeof x !== 'object' || typeof x.type !== 'string' || typeof x.base64 !== 'string') {
    throw new Error(`${where}: expected { "type": "<typed array>", "base64": "…" }`);
  }
  const Ctor = CTORS[x.type];
  if (!Ctor) throw new Error(`${where}: unknown array type "${x.type}" (expected one of ${Object.keys(CTORS).join(', ')})`);
  if (expect && x.type !== expect) throw new Error(`${where}: expected a ${expect}, found a ${x.type}`);
  const text = new Uint8Array(x.base64.length);
  for (let i = 0; i < text.length; i++) text[i] = x.base64.charCodeAt(i) & 255;
  const bytes = decodeBase64(text, 0, text.length, where);
  const size = (Ctor as unknown as { BYTES_PER_ELEMENT: number }).BYTES_PER_ELEMENT;
  if (bytes.length % size !== 0) throw new Error(`${where}: ${bytes.length} bytes is not a whole number of ${x.type} values`);
  const own = new Uint8Array(bytes.length);
  own.set(bytes);
  return new Ctor(own.buffer);
}

/** A field as document text. */
export function encodeField(f: FieldArray): EncodedField {
  return { name: f.name, association: f.association, components: f.components, sourceType: f.sourceType, ...(f.role ? { role: f.role } : {}), values: encodeArray(f.values) };
}

/** A piece (already cut down to its footprint) as document text. */
export function encodePiece(p: Piece, boundary: Float64Array, cellsRead: number): EncodedPiece {
  return {
    cellsRead, cellsKept: p.cellTypes.length,
    points: encodeArray(p.points), cellTypes: encodeArray(p.cellTypes), offsets: encodeArray(p.offsets), connectivity: encodeArray(p.connectivity),
    ...(p.polyFaces ? { polyFaces: { cellFaceStart: encodeArray(p.polyFaces.cellFaceStart), faceOffsets: encodeArray(p.polyFaces.faceOffsets), faceConnectivity: encodeArray(p.polyFaces.faceConnectivity) } } : {}),
    pointData: p.pointData.map(encodeField), cellData: p.cellData.map(encodeField), boundary: encodeArray(boundary),
  };
}
