/**
 * Block boxes of the cut scan: each box holds exactly the nodes of its block's cells (computed by
 * `blockBoxes`, on a scan's demand after `FULL_SCANS` full scans), a block skipped by its box holds no candidate, and a scan that skips blocks on them returns
 * exactly the cells of the rule, by either route of a later scan (coordinates per node when few blocks are
 * crossed, side bytes per point when many are). Reference: a brute-force pass over every cell, written here
 * from the rule in crossingCells.ts.
 */
import { describe, expect, it } from 'vitest';
import { blockBoxes, boxMayCross, CELL_BLOCK, FINE_BLOCK, FULL_SCANS, fineBoxes, hasBlockBoxes } from '../../src/cut/blockBoxes.ts';
import { candidateCells } from '../../src/cut/crossingCells.ts';
import { CellType } from '../../src/model/cellTypes.ts';
import { datasetOf, hexGrid, tetGrid } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { Piece } from '../../src/model/piece.ts';
import { jitteredPolyhedron, jitteredWedge } from '../locate/meshes.ts';

type V3 = [number, number, number];

function nodesOf(p: Piece, c: number): number[] {
  const pf = p.polyFaces;
  if (p.cellTypes[c] === CellType.POLYHEDRON && p.offsets[c] === p.offsets[c + 1] && pf) {
    return Array.from(pf.faceConnectivity.subarray(pf.faceOffsets[pf.cellFaceStart[c]!]!, pf.faceOffsets[pf.cellFaceStart[c + 1]!]!));
  }
  return Array.from(p.connectivity.subarray(p.offsets[c]!, p.offsets[c + 1]!));
}

function expectBoxesHoldNodes(p: Piece, boxes: Float64Array, exact: boolean, cellsPerBox = CELL_BLOCK): void {
  const nb = Math.ceil(p.cellTypes.length / cellsPerBox);
  expect(boxes.length).toBe(6 * nb);
  for (let b = 0; b < nb; b++) {
    const lo = [Infinity, Infinity, Infinity], hi = [-Infinity, -Infinity, -Infinity];
    for (let c = b * cellsPerBox; c < Math.min(p.cellTypes.length, (b + 1) * cellsPerBox); c++) {
      for (const id of nodesOf(p, c)) for (let k = 0; k < 3; k++) { lo[k] = Math.min(lo[k]!, p.points[3 * id + k]!); hi[k] = Math.max(hi[k]!, p.points[3 * id + k]!); }
    }
    for (let k = 0; k < 3; k++) {
      if (exact) { expect(boxes[6 * b + k]).toBe(lo[k]); expect(boxes[6 * b + 3 + k]).toBe(hi[k]); }
      else { expect(boxes[6 * b + k]!).toBeLessThanOrEqual(lo[k]!); expect(boxes[6 * b + 3 + k]!).toBeGreaterThanOrEqual(hi[k]!); }
    }
  }
}

function bruteForce(d: Dataset, o: V3, n: V3, tol: number): number[] {
  const out: number[] = [];
  let g0 = 0;
  for (const p of d.pieces) {
    for (let c = 0; c < p.cellTypes.length; c++) {
      const t = p.cellTypes[c]!;
      if (t !== CellType.POLYHEDRON && (t < CellType.TETRA || t > CellType.HEXAGONAL_PRISM)) continue;
      let below = false, on = false, above = false;
      for (const id of nodesOf(p, c)) {
        const i = 3 * id;
        const s = n[0] * (p.points[i]! - o[0]) + n[1] * (p.points[i + 1]! - o[1]) + n[2] * (p.points[i + 2]! - o[2]);
        if (Math.abs(s) <= tol) on = true; else if (s < 0) below = true; else above = true;
      }
      if ((below && (on || above)) || (on && above)) out.push(g0 + c);
    }
    g0 += p.cellTypes.length;
  }
  return out;
}

describe('block boxes', () => {
  it('hold exactly the nodes of each block, polyhedra by their face stream', () => {
    for (const p of [hexGrid(7, 6, 9), tetGrid(5, 5, 5), jitteredWedge(6), jitteredPolyhedron(6)]) {
      expectBoxesHoldNodes(p, blockBoxes(p), true);
      expectBoxesHoldNodes(p, fineBoxes(p), true, FINE_BLOCK);
    }
  });

  it('are computed on the scan after `FULL_SCANS` full scans, exact, and later scans give the rule\'s cells throughout', () => {
    for (const p of [hexGrid(20, 20, 20), tetGrid(8, 8, 8), jitteredWedge(6)]) {
      const d = datasetOf([p]), o: V3 = [0.37, 0.41, 0.53], n: V3 = [0, 0.6, 0.8];
      for (let i = 0; i < FULL_SCANS + 2; i++) {
        expect(hasBlockBoxes(p)).toBe(i > FULL_SCANS);
        expect(Array.from(candidateCells(d, ...o, ...n, 1e-10, 'scan').cells)).toEqual(bruteForce(d, o, n, 1e-10));
      }
      expectBoxesHoldNodes(p, blockBoxes(p), true);
      expectBoxesHoldNodes(p, fineBoxes(p), true, FINE_BLOCK);
    }
  });

  it('skip only blocks that hold no candidate: random planes and planes through nodes (brute force per cell)', () => {
    let seed = 12345;
    const rnd = () => { seed = (seed * 1103515245 + 12345) % 2147483648; return seed / 2147483648; };
    for (const p of [hexGrid(12, 11, 10), tetGrid(7, 6, 8), jitteredWedge(6), jitteredPolyhedron(6)]) {
      const d = datasetOf([p]), fine = fineBoxes(p), nc = p.cellTypes.length, np = p.points.length / 3;
      const planes: { o: V3; n: V3 }[] = [];
      for (let i = 0; i < 40; i++) {
        const n: V3 = [rnd() - 0.5, rnd() - 0.5, rnd() - 0.5], l = Math.hypot(...n);
        // half the planes pass through a node of the mesh (on-plane nodes are candidates' business)
        const j = 3 * Math.floor(rnd() * np);
        const o: V3 = i % 2 === 0 ? [rnd(), rnd(), rnd()] : [p.points[j]!, p.points[j + 1]!, p.points[j + 2]!];
        planes.push({ o, n: [n[0] / l, n[1] / l, n[2] / l] });
      }
      for (const axis of [0, 1, 2]) { const j = 3 * Math.floor(np / 2); const n: V3 = [0, 0, 0]; n[axis] = 1; planes.push({ o: [p.points[j]!, p.points[j + 1]!, p.points[j + 2]!], n }); }
      let skipped = 0;
      for (const { o, n } of planes) {
        const want = new Set(bruteForce(d, o, n, 1e-10));
        for (let f = 0; f < fine.length / 6; f++) {
          if (boxMayCross(fine, 6 * f, ...o, ...n, 1e-10)) continue;
          skipped++;
          for (let c = f * FINE_BLOCK; c < Math.min(nc, (f + 1) * FINE_BLOCK); c++) expect(want.has(c), `cell ${c} in skipped block ${f}`).toBe(false);
        }
        expect(Array.from(candidateCells(d, ...o, ...n, 1e-10, 'scan').cells)).toEqual([...want]);
      }
      expect(skipped).toBeGreaterThan(0);
    }
  });

  it('are skipped only when wholly beyond the tolerance on one side', () => {
    const box = Float64Array.of(0, 0, 0, 1, 1, 1);
    expect(boxMayCross(box, 0, 1.5, 0, 0, 1, 0, 0, 0.1)).toBe(false);
    expect(boxMayCross(box, 0, 1.05, 0, 0, 1, 0, 0, 0.1)).toBe(true);
    expect(boxMayCross(box, 0, 1, 0, 0, 1, 0, 0, 0)).toBe(true);
    expect(boxMayCross(box, 0, -0.2, 0, 0, -1, 0, 0, 0.1)).toBe(false);
    expect(boxMayCross(Float64Array.of(0, NaN, 0, 1, 1, 1), 0, 5, 5, 5, 1, 0, 0, 0)).toBe(true);
  });

  it('let later scans return exactly the rule\'s cells by either route (few crossed blocks, many crossed blocks)', () => {
    const d = datasetOf([hexGrid(20, 20, 20), tetGrid(6, 6, 6, (u, v, w) => [u, v, 1 + w])]);
    const planes: { o: V3; n: V3 }[] = [
      { o: [0.5, 0.5, 0.5], n: [0, 0, 1] },       // a lattice layer: few blocks, nodes on the plane
      { o: [0.5, 0.5, 0.52], n: [0, 0, 1] },      // between layers
      { o: [0.35, 0.5, 0.5], n: [1, 0, 0] },      // across every row: many blocks
      { o: [0.5, 0.5, 1.0], n: [0, 0, 1] },       // the face between the two pieces
      { o: [0.31, 0.47, 0.73], n: [0.3, -0.5, 0.81] },
      { o: [0.5, 0.5, 3], n: [0, 0, 1] },         // misses everything
      { o: [0.5, 0.5, 0.5], n: [1, 0, 0] },       // a layer of nodes across every row: one fine block a row
      { o: [0.401, 0.5, 0.5], n: [-1, 0.01, 0] }, // fine blocks of one row side by side
    ];
    for (let pass = 0; pass < 2; pass++) {
      for (const { o, n } of planes) {
        const l = Math.hypot(...n), u: V3 = [n[0] / l, n[1] / l, n[2] / l];
        expect(Array.from(candidateCells(d, ...o, ...u, 1e-10, 'scan').cells), `${o} ${n}`).toEqual(bruteForce(d, o, u, 1e-10));
      }
    }
  });
});
