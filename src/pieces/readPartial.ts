/**
 * Reads a partial-results document (`partialDoc.ts`) from its text and checks it at the edge: format and
 * version, the set and task identity, and every piece's arrays (sizes, node numbers in range, field
 * lengths, ascending boundary keys). Errors are one line naming the file and the member, e.g.
 * `part-1.json: pieces[0].connectivity: node 812 of cell 3 is not below the piece's 640 points`.
 */
import type { FieldArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import { FACE_SLOTS } from '../surface/boundaryFaces.ts';
import { decodeArray, PARTIAL_FORMAT, PARTIAL_VERSION, type EncodedField, type PartialDoc } from './partialDoc.ts';

/** A document read back: its header and decoded pieces with their boundary keys. */
export interface PartialRead {
  /** The document's file name, for messages. */
  file: string;
  doc: PartialDoc;
  pieces: Piece[];
  boundary: Float64Array[];
  fieldData: FieldArray[];
}

const isInt = (v: unknown): v is number => typeof v === 'number' && Number.isInteger(v);

function need(ok: boolean, where: string, what: string): void {
  if (!ok) throw new Error(`${where}: expected ${what}`);
}

function decodeField(e: EncodedField, where: string, tuples: number): FieldArray {
  need(!!e && typeof e.name === 'string' && isInt(e.components) && e.components >= 1 && typeof e.sourceType === 'string', where, 'a field { name, association, components, sourceType, values }');
  const values = decodeArray(e.values, `${where} "${e.name}"`);
  if (tuples >= 0 && values.length !== tuples * e.components) {
    throw new Error(`${where} "${e.name}": holds ${values.length} values, expected ${tuples} tuples × ${e.components} components = ${tuples * e.components}`);
  }
  return { name: e.name, association: e.association, components: e.components, sourceType: e.sourceType, values, ...(e.role ? { role: e.role } : {}) };
}

function decodePiece(file: string, e: PartialDoc['pieces'][number], k: number): { piece: Piece; boundary: Float64Array } {
  const at = `${file}: pieces[${k}]`;
  need(!!e && typeof e === 'object', at, 'a piece object');
  const points = decodeArray(e.points, `${at}.points`, 'Float64Array') as Float64Array;
  need(points.length % 3 === 0, `${at}.points`, 'x, y, z per point');
  const nPoints = points.length / 3;
  const cellTypes = decodeArray(e.cellTypes, `${at}.cellTypes`, 'Uint8Array') as Uint8Array;
  const offsets = decodeArray(e.offsets, `${at}.offsets`, 'Int32Array') as Int32Array;
  const connectivity = decodeArray(e.connectivity, `${at}.connectivity`, 'Int32Array') as Int32Array;
  const n = cellTypes.length;
  need(offsets.length === n + 1 && offsets[0] === 0 && offsets[n] === connectivity.length, `${at}.offsets`, `${n + 1} offsets from 0 to the ${connectivity.length} connectivity entries`);
  for (let c = 0; c < n; c++) {
    if (offsets[c + 1]! < offsets[c]!) throw new Error(`${at}.offsets: offset of cell ${c + 1} is below that of cell ${c}`);
    for (let q = offsets[c]!; q < offsets[c + 1]!; q++) {
      const v = connectivity[q]!;
      if (v < 0 || v >= nPoints) throw new Error(`${at}.connectivity: node ${v} of cell ${c} is not below the piece's ${nPoints} points`);
    }
  }
  let polyFaces: Piece['polyFaces'];
  if (e.polyFaces) {
    const cellFaceStart = decodeArray(e.polyFaces.cellFaceStart, `${at}.polyFaces.cellFaceStart`, 'Int32Array') as Int32Array;
    const faceOffsets = decodeArray(e.polyFaces.faceOffsets, `${at}.polyFaces.faceOffsets`, 'Int32Array') as Int32Array;
    const faceConnectivity = decodeArray(e.polyFaces.faceConnectivity, `${at}.polyFaces.faceConnectivity`, 'Int32Array') as Int32Array;
    const nf = faceOffsets.length - 1;
    need(cellFaceStart.length === n + 1 && cellFaceStart[0] === 0 && cellFaceStart[n] === nf && nf >= 0 && faceOffsets[0] === 0 && faceOffsets[nf] === faceConnectivity.length,
      `${at}.polyFaces`, 'face starts per cell, face offsets and face nodes that agree in size');
    for (let c = 0; c < n; c++) if (cellFaceStart[c + 1]! < cellFaceStart[c]!) throw new Error(`${at}.polyFaces.cellFaceStart: decreases at cell ${c}`);
    for (let f = 0; f < nf; f++) if (faceOffsets[f + 1]! < faceOffsets[f]!) throw new Error(`${at}.polyFaces.faceOffsets: decreases at face ${f}`);
    for (const v of faceConnectivity) if (v < 0 || v >= nPoints) throw new Error(`${at}.polyFaces.faceConnectivity: node ${v} is not below the piece's ${nPoints} points`);
    polyFaces = { cellFaceStart, faceOffsets, faceConnectivity };
  }
  need(Array.isArray(e.pointData) && Array.isArray(e.cellData), at, 'pointData and cellData lists');
  const pointData = e.pointData.map((f, i) => decodeField(f, `${at}.pointData[${i}]`, nPoints));
  const cellData = e.cellData.map((f, i) => decodeField(f, `${at}.cellData[${i}]`, n));
  const boundary = decodeArray(e.boundary, `${at}.boundary`, 'Float64Array') as Float64Array;
  for (let i = 0; i < boundary.length; i++) {
    const key = boundary[i]!;
    if (!(isInt(key) && key >= 0 && key < n * FACE_SLOTS) || (i > 0 && !(key > boundary[i - 1]!))) {
      throw new Error(`${at}.boundary: key ${key} (entry ${i}) is not an ascending face key of the piece's ${n} cells`);
    }
  }
  return { piece: { points, cellTypes, offsets, connectivity, ...(polyFaces ? { polyFaces } : {}), pointData, cellData }, boundary };
}

/** Parses and checks one document; `file` names it in every error. */
export function readPartial(text: string, file: string): PartialRead {
  let doc: PartialDoc;
  try {
    doc = JSON.parse(text) as PartialDoc;
  } catch (e) {
    throw new Error(`${file}: not a JSON document (${(e as Error).message.split('\n')[0]})`);
  }
  if (!doc || typeof doc !== 'object' || doc.format !== PARTIAL_FORMAT) {
    throw new Error(`${file}: not a partial-results document (expected "format": "${PARTIAL_FORMAT}", as \`fieldtally partial\` writes)`);
  }
  if (!isInt(doc.version) || doc.version < 1 || doc.version > PARTIAL_VERSION) {
    throw new Error(`${file}: partial-results version ${String(doc.version)} is not one this tool reads (1 to ${PARTIAL_VERSION})`);
  }
  const s = doc.set, t = doc.task, p = doc.probeSet, d = doc.dataset;
  need(!!s && typeof s.file === 'string' && typeof s.source === 'string' && typeof s.sha256 === 'string' && isInt(s.leaves) && s.leaves >= 0, `${file}: set`, '{ file, source, sha256, leaves }');
  need(!!t && isInt(t.count) && t.count >= 1 && isInt(t.index) && t.index >= 0 && t.index < t.count && isInt(t.firstLeaf) && isInt(t.endLeaf), `${file}: task`, '{ index, count, firstLeaf, endLeaf } with 0 ≤ index < count');
  need(!!p && typeof p.text === 'string' && typeof p.sha256 === 'string' && typeof p.name === 'string', `${file}: probeSet`, '{ name, sha256, text }');
  need(Array.isArray(doc.inputs) && doc.inputs.every((x) => x && typeof x.name === 'string' && typeof x.order === 'number'), `${file}: inputs`, 'a list of { name, bytes, sha256, role, order }');
  need(!!d && Array.isArray(d.fieldData) && Array.isArray(d.warnings) && (d.bounds === null || (Array.isArray(d.bounds) && d.bounds.length === 6 && d.bounds.every(Number.isFinite))), `${file}: dataset`, '{ kind, bounds (6 numbers or null), fileCellTypes, fieldData, warnings }');
  need(Array.isArray(doc.pieces), `${file}: pieces`, 'a list');
  const decoded = doc.pieces.map((e, k) => decodePiece(file, e, k));
  const fieldData = d.fieldData.map((f, i) => decodeField(f, `${file}: dataset.fieldData[${i}]`, -1));
  return { file, doc, pieces: decoded.map((x) => x.piece), boundary: decoded.map((x) => x.boundary), fieldData };
}
