/**
 * Keeps the face table of boundary extraction small: a face whose node is used by no later cell can never be
 * met again, so it is final (boundary) and leaves the table for a flat list. Without this the table ends up
 * holding every boundary face, and on a mesh of millions of cells it outgrows the caches, so each lookup
 * becomes a cache miss and the cost grows faster than the cell count. With it the table holds about the
 * front between cells seen and not yet seen.
 *
 * `lastUse[q]` is the last global cell (numbering of `cellStarts`) using merged point q. A face in the table
 * is final once the cell being processed is beyond `lastUse` of any of its key's nodes (the three smallest
 * node ids, and the fourth of a quadrilateral; using fewer nodes than the face has only keeps it longer).
 */
import type { Dataset } from '../model/dataset.ts';
import { cellCount } from '../model/piece.ts';
import { FaceTable } from './faceTable.ts';
import type { PointMerge } from './pointMerge.ts';

/** Last global cell using each merged point (−1 for unused points); points of polyhedra from their face streams too. */
export function lastCellOfPoints(d: Dataset, merge: PointMerge, cellStart: Int32Array): Int32Array {
  const total = merge.starts[merge.starts.length - 1]!;
  const last = new Int32Array(total).fill(-1);
  const map = merge.map;
  for (let k = 0; k < d.pieces.length; k++) {
    const p = d.pieces[k]!, conn = p.connectivity, offs = p.offsets, s0 = merge.starts[k]!, g0 = cellStart[k]!, n = cellCount(p);
    for (let c = 0; c < n; c++) {
      const g = g0 + c;
      for (let q = offs[c]!; q < offs[c + 1]!; q++) last[map ? map[s0 + conn[q]!]! : s0 + conn[q]!] = g;
    }
    const pf = p.polyFaces;
    if (!pf) continue;
    for (let c = 0; c < n; c++) {
      const g = g0 + c;
      for (let q = pf.faceOffsets[pf.cellFaceStart[c]!]!; q < pf.faceOffsets[pf.cellFaceStart[c + 1]!]!; q++) {
        const id = map ? map[s0 + pf.faceConnectivity[q]!]! : s0 + pf.faceConnectivity[q]!;
        if (last[id]! < g) last[id] = g;
      }
    }
  }
  return last;
}

/** Final faces retired so far, as sort keys `cell × slots + face`. */
export class RetiredFaces {
  keys = new Float64Array(1024);
  count = 0;

  push(key: number): void {
    if (this.count === this.keys.length) { const k = new Float64Array(2 * this.count); k.set(this.keys); this.keys = k; }
    this.keys[this.count++] = key;
  }
}

/**
 * Moves the faces of `table` that are final before global cell `g` into `out` (as `vals[0] × slots + vals[1]`)
 * and returns a table holding the others.
 */
export function retireFinal(table: FaceTable, lastUse: Int32Array, g: number, slots: number, out: RetiredFaces): FaceTable {
  const keys = table.keys, vals = table.vals;
  let kept = 0;
  for (let s = 0; s <= table.mask; s++) {
    const b = 4 * s, k0 = keys[b]!;
    if (k0 === -1) continue;
    const k3 = keys[b + 3]!;
    if (lastUse[k0]! < g || lastUse[keys[b + 1]!]! < g || lastUse[keys[b + 2]!]! < g || (k3 >= 0 && lastUse[k3]! < g)) {
      out.push(vals[2 * s]! * slots + vals[2 * s + 1]!);
      keys[b] = -2; // retired (the old table is dropped after this pass)
    } else kept++;
  }
  const next = new FaceTable(kept);
  for (let s = 0; s <= table.mask; s++) {
    const b = 4 * s;
    if (keys[b]! < 0) continue;
    next.insert(keys[b]!, keys[b + 1]!, keys[b + 2]!, keys[b + 3]!, vals[2 * s]!, vals[2 * s + 1]!);
  }
  return next;
}
