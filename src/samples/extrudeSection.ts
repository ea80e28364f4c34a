/**
 * Straight extrusion of a planar cross-section mesh along +z: quadrilaterals become hexahedra,
 * triangles become wedges. Used by the pipe sample (and any channel of constant section).
 */
import { CellType } from '../model/cellTypes.ts';
import type { Piece } from '../model/piece.ts';
import { validatePiece } from '../model/validate.ts';

/**
 * A cross-section in the xy-plane. Layout: `points` xy-interleaved (m); cell `c` has nodes
 * `nodes[offsets[c] .. offsets[c+1]-1]`, 3 (triangle) or 4 (quadrilateral) of them, counter-clockwise
 * seen from +z.
 */
export interface Section {
  points: Float64Array;
  offsets: Int32Array;
  nodes: Int32Array;
}

/** Signed area of section cell `c` (m²); positive when counter-clockwise. */
export function sectionCellArea(s: Section, c: number): number {
  const a = s.offsets[c]!, b = s.offsets[c + 1]!;
  let twice = 0;
  for (let k = a; k < b; k++) {
    const i = s.nodes[k]!, j = s.nodes[k + 1 < b ? k + 1 : a]!;
    twice += s.points[2 * i]! * s.points[2 * j + 1]! - s.points[2 * j]! * s.points[2 * i + 1]!;
  }
  return twice / 2;
}

/** Throws unless every section cell has 3 or 4 nodes and a positive area. `where` names the caller. */
export function checkSection(s: Section, where: string): void {
  const n = s.offsets.length - 1;
  for (let c = 0; c < n; c++) {
    const k = s.offsets[c + 1]! - s.offsets[c]!;
    if (k !== 3 && k !== 4) throw new Error(`${where}: section cell ${c} has ${k} nodes, expected 3 or 4`);
    const area = sectionCellArea(s, c);
    if (!(area > 0)) throw new Error(`${where}: section cell ${c} has area ${area}, expected > 0 (counter-clockwise nodes)`);
  }
}

/**
 * Extrudes `s` through the stations `zs` (increasing, m): one layer of cells between consecutive
 * stations. Point `s + l·nSection` is section point `s` at station `l`; cells run section-cell fastest.
 */
export function extrudeSection(s: Section, zs: ArrayLike<number>): Piece {
  const nS = s.points.length / 2, nC = s.offsets.length - 1, nL = zs.length - 1;
  const points = new Float64Array(3 * nS * zs.length);
  for (let l = 0, o = 0; l < zs.length; l++) {
    const z = zs[l]!;
    for (let i = 0; i < nS; i++, o += 3) { points[o] = s.points[2 * i]!; points[o + 1] = s.points[2 * i + 1]!; points[o + 2] = z; }
  }
  const nodesPerLayer = 2 * s.nodes.length;
  const cellTypes = new Uint8Array(nC * nL), offsets = new Int32Array(nC * nL + 1), connectivity = new Int32Array(nodesPerLayer * nL);
  let c = 0, o = 0;
  for (let l = 0; l < nL; l++) {
    const lo = l * nS, hi = lo + nS;
    for (let q = 0; q < nC; q++, c++) {
      const a = s.offsets[q]!, k = s.offsets[q + 1]! - a;
      if (k === 4) {
        // VTK hexahedron: bottom quad counter-clockwise seen from the top, then the top quad.
        for (let t = 0; t < 4; t++) connectivity[o + t] = lo + s.nodes[a + t]!;
        for (let t = 0; t < 4; t++) connectivity[o + 4 + t] = hi + s.nodes[a + t]!;
        cellTypes[c] = CellType.HEXAHEDRON;
        o += 8;
      } else {
        // VTK wedge: the first triangle's normal points away from the second, so it runs clockwise from the top.
        const n0 = s.nodes[a]!, n1 = s.nodes[a + 2]!, n2 = s.nodes[a + 1]!;
        connectivity[o] = lo + n0; connectivity[o + 1] = lo + n1; connectivity[o + 2] = lo + n2;
        connectivity[o + 3] = hi + n0; connectivity[o + 4] = hi + n1; connectivity[o + 5] = hi + n2;
        cellTypes[c] = CellType.WEDGE;
        o += 6;
      }
      offsets[c + 1] = o;
    }
  }
  const piece: Piece = { points, cellTypes, offsets, connectivity, pointData: [], cellData: [] };
  validatePiece(piece, 'extrudeSection');
  return piece;
}
