/**
 * Boundary extraction toggles faces in lists under their smallest node (src/surface/faceLists.ts). Checked
 * against a plain count of every cell face by its sorted node ids (a face used once is boundary): the same
 * (cell, face) pairs, on every volume cell type, polyhedra included, in one piece, in pieces matched by
 * coordinates listed in both orders, and with the cells in a shuffled order (lists then long and out of
 * sequence). The whole boundary of a unit cube has area 6 (exact).
 */
import { describe, expect, it } from 'vitest';
import { FACE_TABLE } from '../../src/model/cellTypes.ts';
import { datasetOf } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { subPiece } from '../../src/pieces/subPiece.ts';
import { boundaryFaces, totalArea } from '../../src/surface/boundaryFaces.ts';
import { FaceLists } from '../../src/surface/faceLists.ts';
import { meshesOfEveryType, rng } from '../locate/meshes.ts';

function slabs(p: Piece, n: number): Piece[] {
  const lists: number[][] = Array.from({ length: n }, () => []);
  for (let c = 0; c < p.cellTypes.length; c++) {
    let z = 0;
    for (let q = p.offsets[c]!; q < p.offsets[c + 1]!; q++) z += p.points[3 * p.connectivity[q]! + 2]!;
    lists[Math.min(n - 1, Math.floor((z / (p.offsets[c + 1]! - p.offsets[c]!)) * n))]!.push(c);
  }
  return lists.map((cells) => subPiece(p, Int32Array.from(cells), new Float64Array(0)).piece);
}

function shuffled(p: Piece, seed: number): Piece {
  const order = Array.from(p.cellTypes, (_, c) => c), r = rng(seed);
  for (let i = order.length - 1; i > 0; i--) { const j = Math.floor(r() * (i + 1)); [order[i], order[j]] = [order[j]!, order[i]!]; }
  return subPiece(p, Int32Array.from(order), new Float64Array(0)).piece;
}

/** `cell:face` of every face used by exactly one cell of a one-piece mesh, counted by sorted node ids. */
function usedOnce(p: Piece): string[] {
  const seen = new Map<string, { n: number; at: string }>();
  for (let c = 0; c < p.cellTypes.length; c++) {
    const t = p.cellTypes[c]!, o = p.offsets[c]!;
    const faces: number[][] = [];
    if (t === 42) {
      const pf = p.polyFaces!;
      for (let f = pf.cellFaceStart[c]!; f < pf.cellFaceStart[c + 1]!; f++) faces.push([...pf.faceConnectivity.subarray(pf.faceOffsets[f]!, pf.faceOffsets[f + 1]!)]);
    } else {
      for (let f = FACE_TABLE.start[t]!; f < FACE_TABLE.start[t + 1]!; f++) {
        const q = FACE_TABLE.first[f]!;
        faces.push(Array.from({ length: FACE_TABLE.size[f]! }, (_, j) => p.connectivity[o + FACE_TABLE.nodes[q + j]!]!));
      }
    }
    faces.forEach((nodes, i) => {
      const k = [...nodes].sort((a, b) => a - b).join(',');
      const e = seen.get(k);
      if (e) e.n++; else seen.set(k, { n: 1, at: `${c}:${i}` });
    });
  }
  return [...seen.values()].filter((e) => e.n % 2 === 1).map((e) => e.at).sort();
}

describe('boundary faces from lists under the smallest node', () => {
  for (const { name, dataset } of meshesOfEveryType(6)) {
    it(`${name}: the faces used once, in one piece, in pieces and with cells shuffled`, () => {
      const p = dataset.pieces[0]!;
      for (const q of [p, shuffled(p, 7)]) {
        const f = boundaryFaces(datasetOf([q]));
        expect(Array.from(f.cell, (c, i) => `${c}:${f.localFace[i]}`).sort()).toEqual(usedOnce(q));
        if (name !== 'voxel') expect(totalArea(f)).toBeCloseTo(6, 12);
      }
      const one = boundaryFaces(dataset);
      for (const d of [datasetOf(slabs(p, 3)), datasetOf(slabs(p, 3).reverse())]) {
        const f = boundaryFaces(d);
        expect(f.count).toBe(one.count);
        if (name !== 'voxel') expect(totalArea(f)).toBeCloseTo(6, 12);
      }
    });
  }

  it('reuses a freed entry, grows past its first size and keeps faces sharing a smallest node apart', () => {
    const l = new FaceLists(4000, 0);
    expect(l.toggle(0, 1, 2, -1, 10, 0)).toBe(true);
    expect(l.toggle(0, 1, 3, -1, 11, 0)).toBe(true);
    expect(l.toggle(0, 1, 2, -1, 12, 1)).toBe(false);
    expect([l.live, l.used]).toEqual([1, 2]);
    expect(l.toggle(0, 2, 3, -1, 13, 2)).toBe(true);
    expect([l.live, l.used]).toEqual([2, 2]);
    for (let k = 1; k < 3000; k++) l.toggle(k, k + 1, k + 2, k + 3, k, 5);
    expect(l.live).toBe(3001);
    const keys = new Float64Array(l.live);
    expect(l.valueKeys(100, keys, 0)).toBe(3001);
    expect([...keys].slice(0, 2).sort((a, b) => a - b)).toEqual([1100, 1302]);
    expect(keys[2]).toBe(105);
  });
});
