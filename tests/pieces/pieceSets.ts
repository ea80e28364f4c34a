/**
 * Test helper: piece sets made from one-piece datasets. Cells (volume and surface alike) go to pieces by a
 * rule on their vertex average (bands along an axis, or any function), each piece keeping its own copy of
 * the points on its faces towards other pieces (as solvers write them); optionally with a global point-id
 * array. Written as `.pvtu` with `.vtu` pieces, or as a `.vtm` naming the pieces (optionally through a
 * nested `.pvtu`).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { writeVtu, type VtuEncoding } from '../../src/io/writeVtu.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { cellCount, type Piece } from '../../src/model/piece.ts';
import { subPiece } from '../../src/pieces/subPiece.ts';

/** Which piece a cell goes to, from its vertex average. */
export type PieceRule = (x: number, y: number, z: number) => number;

/** `n` equal bands of the coordinate `axis` over [lo, hi]. */
export const bands = (axis: 0 | 1 | 2, lo: number, hi: number, n: number): PieceRule =>
  (...x) => Math.min(n - 1, Math.max(0, Math.floor(((x[axis] - lo) / (hi - lo)) * n)));

/** Splits the one piece of `d` into `n` pieces by `rule`; with `globalIds`, each piece carries the original point numbers. */
export function splitDataset(d: Dataset, n: number, rule: PieceRule, globalIds = false): Piece[] {
  const p0 = d.pieces[0]!;
  const p: Piece = globalIds
    ? { ...p0, pointData: [...p0.pointData, { name: 'GlobalNodeIds', association: 'point', components: 1, values: Int32Array.from({ length: p0.points.length / 3 }, (_, i) => i), sourceType: 'Int32', role: 'globalIds' }] }
    : p0;
  const lists: number[][] = Array.from({ length: n }, () => []);
  for (let c = 0; c < cellCount(p); c++) {
    let x = 0, y = 0, z = 0;
    const a = p.offsets[c]!, b = p.offsets[c + 1]!;
    for (let q = a; q < b; q++) { const i = 3 * p.connectivity[q]!; x += p.points[i]!; y += p.points[i + 1]!; z += p.points[i + 2]!; }
    const m = b - a;
    lists[rule(x / m, y / m, z / m)]!.push(c);
  }
  return lists.map((cells) => subPiece(p, Int32Array.from(cells), new Float64Array(0)).piece);
}

const one = (d: Dataset, piece: Piece): Dataset => ({ ...d, pieces: [piece], assembled: undefined });

/** Writes `<name>.pvtu` and `<name>_<k>.vtu` into `dir`; returns the set's path. */
export function writePvtu(dir: string, name: string, d: Dataset, pieces: Piece[], encoding: VtuEncoding = 'appended-raw'): string {
  mkdirSync(dir, { recursive: true });
  const p0 = pieces[0]!;
  const decl = (fs: Piece['pointData']) => fs.map((f) => `<PDataArray type="${f.sourceType}" Name="${f.name}" NumberOfComponents="${f.components}"/>`).join('');
  const lines = pieces.map((p, k) => {
    writeFileSync(join(dir, `${name}_${k}.vtu`), writeVtu(one(d, p), { encoding }));
    return `<Piece Source="${name}_${k}.vtu"/>`;
  });
  const text = `<?xml version="1.0"?>\n<VTKFile type="PUnstructuredGrid" version="1.0" byte_order="LittleEndian" header_type="UInt64">\n<PUnstructuredGrid GhostLevel="0">\n` +
    `<PPointData>${decl(p0.pointData)}</PPointData><PCellData>${decl(p0.cellData)}</PCellData><PPoints><PDataArray type="Float64" NumberOfComponents="3"/></PPoints>\n${lines.join('\n')}\n</PUnstructuredGrid>\n</VTKFile>\n`;
  const path = join(dir, `${name}.pvtu`);
  writeFileSync(path, text);
  return path;
}

/** Writes `<name>.vtm` whose blocks are the pieces (`blocks/<name>_<k>.vtu`), the last `nested` of them through a nested `.pvtu`. */
export function writeVtm(dir: string, name: string, d: Dataset, pieces: Piece[], nested = 0): string {
  mkdirSync(join(dir, 'blocks'), { recursive: true });
  const direct = pieces.length - nested;
  const blocks = pieces.slice(0, direct).map((p, k) => {
    writeFileSync(join(dir, 'blocks', `${name}_${k}.vtu`), writeVtu(one(d, p), { encoding: k % 2 ? 'zlib' : 'base64' }));
    return `<DataSet index="${k}" file="blocks/${name}_${k}.vtu"/>`;
  });
  if (nested > 0) {
    writePvtu(join(dir, 'inner'), `${name}-inner`, d, pieces.slice(direct), 'ascii');
    blocks.push(`<Block index="${direct}" name="inner"><DataSet index="0" file="inner/${name}-inner.pvtu"/></Block>`);
  }
  const text = `<?xml version="1.0"?>\n<VTKFile type="vtkMultiBlockDataSet" version="1.0" byte_order="LittleEndian">\n<vtkMultiBlockDataSet>\n${blocks.join('\n')}\n</vtkMultiBlockDataSet>\n</VTKFile>\n`;
  const path = join(dir, `${name}.vtm`);
  writeFileSync(path, text);
  return path;
}

/**
 * Like `splitDataset`, but each piece also holds one layer of ghost cells: every cell of another piece that
 * shares a node with one of its own cells, flagged 1 (a duplicate of another piece's cell) in a UInt8 cell
 * array `vtkGhostType`, VTK's ghost convention; own cells are flagged `ownFlag` (0, or bits that keep a cell).
 * With `pointFlags`, a point array of the same name flags the points only ghost cells use.
 */
export function splitWithGhosts(d: Dataset, n: number, rule: PieceRule, ownFlag = 0, pointFlags = false): Piece[] {
  const p = d.pieces[0]!, nc = cellCount(p);
  const owner = new Int32Array(nc);
  for (let c = 0; c < nc; c++) {
    let x = 0, y = 0, z = 0;
    const a = p.offsets[c]!, b = p.offsets[c + 1]!;
    for (let q = a; q < b; q++) { const i = 3 * p.connectivity[q]!; x += p.points[i]!; y += p.points[i + 1]!; z += p.points[i + 2]!; }
    owner[c] = rule(x / (b - a), y / (b - a), z / (b - a));
  }
  return Array.from({ length: n }, (_, k) => {
    const touched = new Uint8Array(p.points.length / 3);
    for (let c = 0; c < nc; c++) if (owner[c] === k) for (let q = p.offsets[c]!; q < p.offsets[c + 1]!; q++) touched[p.connectivity[q]!] = 1;
    const cells: number[] = [];
    const flags = new Uint8Array(nc);
    for (let c = 0; c < nc; c++) {
      if (owner[c] === k) { cells.push(c); flags[c] = ownFlag; continue; }
      for (let q = p.offsets[c]!; q < p.offsets[c + 1]!; q++) if (touched[p.connectivity[q]!]) { cells.push(c); flags[c] = 1; break; }
    }
    const pointData = pointFlags
      ? [...p.pointData, { name: 'vtkGhostType', association: 'point' as const, components: 1, values: Uint8Array.from(touched, (t) => (t ? 0 : 1)), sourceType: 'UInt8' }]
      : p.pointData;
    const flagged: Piece = { ...p, pointData, cellData: [...p.cellData, { name: 'vtkGhostType', association: 'cell', components: 1, values: flags, sourceType: 'UInt8' }] };
    return subPiece(flagged, Int32Array.from(cells), new Float64Array(0)).piece;
  });
}
