/**
 * Cell lists of legacy `.vtk` files (`CELLS`, `VERTICES`, `LINES`, `POLYGONS`, `TRIANGLE_STRIPS`) in
 * both layouts, turned into offsets (length cells + 1) and connectivity:
 *  - before version 5: `KEYWORD n size` then one packed list of `size` integers, each cell as its node
 *    count followed by its point ids (binary: big-endian Int32);
 *  - version 5.x: `KEYWORD nOffsets nConnectivity`, then `OFFSETS <type>` with nOffsets values (cells + 1)
 *    and `CONNECTIVITY <type>` with nConnectivity point ids.
 */
import type { Checkpoint } from './loadOptions.ts';
import { quoted, type LegacyCursor } from './legacyCursor.ts';
import { freshArray } from './elementTypes.ts';
import { numericType } from './legacyTypes.ts';
import { readIds } from './legacyValues.ts';

/** A cell list as read, with the message prefix of its section (for later checks). */
export interface LegacyCellList {
  offsets: Int32Array;
  connectivity: Int32Array;
  where: string;
}

/** Reads a cell list whose keyword was just read (the cursor is after the keyword). */
export async function readCellList(cur: LegacyCursor, keyword: string, cp: Checkpoint): Promise<LegacyCellList> {
  const where = cur.where(keyword);
  const first = cur.count('the cell count', where);
  const second = cur.count('the list size', where);
  if (cur.peekWord()?.toUpperCase() === 'OFFSETS') return readOffsetsLayout(cur, keyword, first, second, where, cp);
  return readPackedLayout(cur, first, second, where, cp);
}

async function readOffsetsLayout(cur: LegacyCursor, keyword: string, nOffsets: number, nConn: number, where: string, cp: Checkpoint): Promise<LegacyCellList> {
  cur.word();
  const offWhere = cur.where(`${keyword} OFFSETS`);
  const offsets = await readIds(cur, nOffsets, numericType(cur.need('the OFFSETS data type', offWhere), offWhere), offWhere, cp);
  cur.skipMetadata();
  const kw = cur.need('CONNECTIVITY', where);
  if (kw.toUpperCase() !== 'CONNECTIVITY') {
    throw new Error(`${cur.where(keyword)}: expected CONNECTIVITY after OFFSETS, found ${quoted(kw)}`);
  }
  const connWhere = cur.where(`${keyword} CONNECTIVITY`);
  const connectivity = await readIds(cur, nConn, numericType(cur.need('the CONNECTIVITY data type', connWhere), connWhere), connWhere, cp);
  cur.skipMetadata();
  if (nOffsets === 0) {
    if (nConn !== 0) throw new Error(`${where}: no offsets but ${nConn} connectivity entries; expected 0`);
    return { offsets: new Int32Array(1), connectivity, where };
  }
  if (offsets[0] !== 0) throw new Error(`${offWhere}: the first offset is ${offsets[0]}, expected 0`);
  for (let c = 1; c < nOffsets; c++) {
    if (offsets[c]! < offsets[c - 1]!) {
      throw new Error(`${offWhere}: offset ${c} (${offsets[c]}) is smaller than offset ${c - 1} (${offsets[c - 1]}); expected non-decreasing offsets`);
    }
  }
  if (offsets[nOffsets - 1] !== nConn) {
    throw new Error(`${offWhere}: the last offset is ${offsets[nOffsets - 1]}, expected ${nConn} (the CONNECTIVITY size)`);
  }
  return { offsets, connectivity, where };
}

async function readPackedLayout(cur: LegacyCursor, nCells: number, size: number, where: string, cp: Checkpoint): Promise<LegacyCellList> {
  if (nCells > size) {
    throw new Error(`${where}: declares ${nCells} cells in a list of ${size} integers; expected a size of at least ${nCells} (each cell starts with its node count)`);
  }
  const packed = await readIds(cur, size, 'Int32', where, cp);
  cur.skipMetadata();
  const offsets = freshArray(Int32Array, nCells + 1, cur.shared), connectivity = freshArray(Int32Array, size - nCells, cur.shared);
  let p = 0, q = 0;
  for (let c = 0; c < nCells; c++) {
    const k = packed[p]!;
    if (p + 1 + k > size) {
      throw new Error(`${where}: cell ${c} declares ${k} nodes at list position ${p}, but the list of ${size} integers ends first`);
    }
    if (q + k > connectivity.length) {
      throw new Error(`${where}: cell ${c} declares ${k} nodes, more than the list of ${size} integers leaves for ${nCells} cells`);
    }
    for (let j = p + 1, e = p + 1 + k; j < e; j++) connectivity[q++] = packed[j]!;
    p += 1 + k;
    offsets[c + 1] = q;
  }
  if (p !== size) {
    throw new Error(`${where}: declares a list of ${size} integers, but its ${nCells} cells use ${p}`);
  }
  return { offsets, connectivity, where };
}

/** Throws unless every point id of `list` is below `nPoints`. */
export function checkPointIds(list: LegacyCellList, nPoints: number): void {
  const conn = list.connectivity, off = list.offsets;
  for (let i = 0; i < conn.length; i++) {
    if (conn[i]! >= nPoints) {
      let c = 0;
      while (off[c + 1]! <= i) c++;
      throw new Error(`${list.where}: cell ${c} refers to point ${conn[i]}, but the file has ${nPoints} points (expected ids 0..${nPoints - 1})`);
    }
  }
}
