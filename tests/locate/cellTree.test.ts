/**
 * The cell tree: structure invariants and every query against a brute-force scan of all cells.
 * Reference: exhaustive comparison (the tree must return every cell a full scan finds, and nothing whose
 * box misses the query); memory goal ≤ 64 bytes per cell from issue 4.
 */
import { describe, expect, it } from 'vitest';
import { datasetOf, hexGrid, tetGrid } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { Bounds } from '../../src/model/bounds.ts';
import {
  buildCellTree, cellsAlongSegment, cellsAtPoint, cellsCrossingPlane, cellsInBox, getCellTree, LEAF, leafBoxes, type CellTree,
} from '../../src/locate/cellTree.ts';
import { jitteredHex, jitteredTet, rng } from './meshes.ts';

/** Exact box of global cell g (no padding). */
function exactBox(d: Dataset, g: number): Bounds {
  let k = 0, c = g;
  while (c >= d.pieces[k]!.cellTypes.length) { c -= d.pieces[k]!.cellTypes.length; k++; }
  const p = d.pieces[k]!, b: Bounds = [Infinity, -Infinity, Infinity, -Infinity, Infinity, -Infinity];
  for (let q = p.offsets[c]!; q < p.offsets[c + 1]!; q++) {
    for (let a = 0; a < 3; a++) {
      const v = p.points[3 * p.connectivity[q]! + a]!;
      b[2 * a] = Math.min(b[2 * a]!, v); b[2 * a + 1] = Math.max(b[2 * a + 1]!, v);
    }
  }
  return b;
}

const sorted = (a: Int32Array) => Array.from(a).sort((x, y) => x - y);

function twoPieces(): Dataset {
  return datasetOf([jitteredHex(6), jitteredTet(4), hexGrid(3, 3, 3, (u, v, w) => [u + 1.5, v, w])]);
}

describe('cell tree', () => {
  it('keeps at most 64 bytes per cell and indexes every cell once, in leaves of LEAF/2 … LEAF cells', () => {
    for (const d of [datasetOf([hexGrid(20, 20, 20)]), datasetOf([tetGrid(10, 10, 10)]), twoPieces()]) {
      const t = buildCellTree(d);
      expect(t.bytes / t.cellCount).toBeLessThanOrEqual(64);
      expect(sorted(t.order)).toEqual(Array.from({ length: t.cellCount }, (_, i) => i));
      for (let i = 0; i < t.nodeCount; i++) {
        const cnt = t.nodeRef[2 * i + 1]!;
        if (cnt > 0) { expect(cnt).toBeLessThanOrEqual(LEAF); expect(cnt).toBeGreaterThanOrEqual(LEAF / 2); continue; }
        // Children's boxes lie inside the parent's.
        for (const ch of [i + 1, t.nodeRef[2 * i]!]) {
          for (let a = 0; a < 3; a++) {
            expect(t.nodeBounds[6 * ch + 2 * a]).toBeGreaterThanOrEqual(t.nodeBounds[6 * i + 2 * a]!);
            expect(t.nodeBounds[6 * ch + 2 * a + 1]).toBeLessThanOrEqual(t.nodeBounds[6 * i + 2 * a + 1]!);
          }
        }
      }
    }
  });

  it('stores each cell box padded outward (Float32 and 8-bit quantisation never cut a cell off), far from the origin too', () => {
    const d = datasetOf([hexGrid(5, 5, 5, (u, v, w) => [1e5 + u, -3e4 + 2 * v, 7 + w]), tetGrid(2, 2, 2, (u, v, w) => [1e5 + u, -3e4 + 2 * v, 8 + w])]);
    const t = buildCellTree(d);
    const out = new Float64Array(6 * LEAF);
    let seen = 0;
    for (let i = 0; i < t.nodeCount; i++) {
      const cnt = leafBoxes(t, i, out);
      for (let j = 0; j < cnt; j++) {
        const b = exactBox(d, t.order[t.nodeRef[2 * i]! + j]!);
        seen++;
        for (let a = 0; a < 3; a++) {
          expect(out[6 * j + 2 * a]).toBeLessThan(b[2 * a]!);
          expect(out[6 * j + 2 * a + 1]).toBeGreaterThan(b[2 * a + 1]!);
          // …and not by much: the quantum is 1/255 of the leaf box.
          expect(b[2 * a]! - out[6 * j + 2 * a]!).toBeLessThan(0.02 * (b[2 * a + 1]! - b[2 * a]!) + 2e-4 * Math.abs(b[2 * a]!));
        }
      }
    }
    expect(seen).toBe(t.cellCount);
  });

  it('is built once per dataset and cached', () => {
    const d = datasetOf([hexGrid(2, 2, 2)]);
    expect(getCellTree(d)).toBe(getCellTree(d));
    expect(buildCellTree(d)).not.toBe(getCellTree(d));
  });

  it('an empty dataset gives an empty tree and empty answers', () => {
    const t = buildCellTree(datasetOf([]));
    expect(t.cellCount).toBe(0);
    expect(cellsAtPoint(t, 0, 0, 0).length).toBe(0);
    expect(cellsCrossingPlane(t, 0, 0, 0, 0, 0, 1).length).toBe(0);
  });

  const d = twoPieces();
  const t: CellTree = getCellTree(d);
  const boxes = Array.from({ length: t.cellCount }, (_, g) => exactBox(d, g));
  const r = rng(21);

  it('cellsCrossingPlane returns every cell whose box the plane crosses, and only cells near it', () => {
    for (let trial = 0; trial < 30; trial++) {
      const o = [2.5 * r(), r(), r()], n = [r() - 0.5, r() - 0.5, r() - 0.5];
      const got = new Set(cellsCrossingPlane(t, o[0]!, o[1]!, o[2]!, n[0]!, n[1]!, n[2]!));
      boxes.forEach((b, g) => {
        let lo = Infinity, hi = -Infinity;
        for (const x of [b[0], b[1]]) for (const y of [b[2], b[3]]) for (const z of [b[4], b[5]]) {
          const s = n[0]! * (x - o[0]!) + n[1]! * (y - o[1]!) + n[2]! * (z - o[2]!);
          lo = Math.min(lo, s); hi = Math.max(hi, s);
        }
        const span = hi - lo;
        if (lo <= 0 && hi >= 0) expect(got.has(g), `cell ${g} crosses the plane`).toBe(true);
        // Extra candidates come within the padding and the 8-bit quantum (1/255 of a leaf box, a few cells).
        else if (got.has(g)) expect(Math.min(Math.abs(lo), Math.abs(hi))).toBeLessThan(0.05 * span + 1e-9);
      });
    }
  });

  it('cellsCrossingPlane writes into a caller buffer when it is long enough', () => {
    const out = new Int32Array(100000);
    const got = cellsCrossingPlane(t, 0.5, 0.5, 0.5, 0, 0, 1, out);
    expect(got.buffer).toBe(out.buffer);
    expect(got.length).toBeGreaterThan(0);
  });

  it('cellsInBox, cellsAtPoint and cellsAlongSegment agree with a brute-force scan', () => {
    for (let trial = 0; trial < 30; trial++) {
      const x0 = 2.5 * r(), y0 = r(), z0 = r();
      const q: Bounds = [x0, x0 + 0.3 * r(), y0, y0 + 0.3 * r(), z0, z0 + 0.3 * r()];
      const inBox = new Set(cellsInBox(t, q));
      const atPoint = new Set(cellsAtPoint(t, x0, y0, z0));
      const x1 = 2.5 * r(), y1 = r(), z1 = r();
      const along = new Set(cellsAlongSegment(t, x0, y0, z0, x1, y1, z1));
      boxes.forEach((b, g) => {
        if (b[0] <= q[1] && b[1] >= q[0] && b[2] <= q[3] && b[3] >= q[2] && b[4] <= q[5] && b[5] >= q[4]) expect(inBox.has(g)).toBe(true);
        if (b[0] <= x0 && x0 <= b[1] && b[2] <= y0 && y0 <= b[3] && b[4] <= z0 && z0 <= b[5]) expect(atPoint.has(g)).toBe(true);
        // Segment against box by dense sampling (a hit found this way must be reported).
        for (let k = 0; k <= 200; k++) {
          const s = k / 200, x = x0 + s * (x1 - x0), y = y0 + s * (y1 - y0), z = z0 + s * (z1 - z0);
          if (b[0] <= x && x <= b[1] && b[2] <= y && y <= b[3] && b[4] <= z && z <= b[5]) { expect(along.has(g)).toBe(true); break; }
        }
      });
    }
  });
});
