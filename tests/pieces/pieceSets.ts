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
