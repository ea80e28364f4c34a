/**
 * Combining the partial results of the cell shares (`shareTasks.ts`) into exactly what the single-thread
 * kernels give on the whole dataset:
 *  - cut: merged in place in shared memory by `placeCuts.ts`; the merged cut is then selected and integrated
 *    once, by the single-thread code, so every integral is the same sum in the same order.
 *  - line: each sample goes to the holder the single-thread tie rule picks (smallest max(violation, 0), then the
 *    lowest global cell id), and takes that share's values.
 *  - boundary: a face met once by each of two shares is interior and cancels (the face table's toggle, over
 *    the shares' faces); the rest keep share order, which is the single-thread (cell, face) order.
 */
import type { Vec3 } from '../cut/triangleSet.ts';
import { FACE_TABLE } from '../model/cellTypes.ts';
import { cellStarts, type Dataset } from '../model/dataset.ts';
import type { LineProbeResult } from '../locate/lineProbe.ts';
import type { SampledField } from '../locate/probeFields.ts';
import type { BoundaryFaces } from '../surface/boundaryFaces.ts';
import { FaceTable, faceKey } from '../surface/faceTable.ts';
import type { BoundaryPart, LinePart } from './shareTasks.ts';

/**
 * Merges the shares' samples of A→B (evenly spaced, `count` of them) into the result `probeLine` gives:
 * positions, validity, cells, values, interval flags, and the empty result when no share holds a sample.
 */
export function mergeLines(parts: readonly LinePart[], from: Vec3, to: Vec3, count: number): LineProbeResult {
  const dx = to[0] - from[0], dy = to[1] - from[1], dz = to[2] - from[2];
  const length = Math.hypot(dx, dy, dz);
  const n = count;
  const win = new Int32Array(n).fill(-1);
  let validCount = 0;
  for (let i = 0; i < n; i++) {
    let best = -1;
    for (let p = 0; p < parts.length; p++) {
      const c = parts[p]!.cell[i]!;
      if (c < 0) continue;
      const b = best < 0 ? null : parts[best]!;
      if (!b || parts[p]!.rank[i]! < b.rank[i]! || (parts[p]!.rank[i] === b.rank[i] && c < b.cell[i]!)) best = p;
    }
    win[i] = best;
    if (best >= 0) validCount++;
  }
  const template = parts[0]!.fields;
  if (validCount === 0) {
    const none = template.map((f): SampledField => ({ ...f, columns: f.columns.map(() => new Float64Array(0)) }));
    return {
      from, to, length, mode: 'samples', count: 0, validCount: 0, outside: true,
      s: new Float64Array(0), x: new Float64Array(0), y: new Float64Array(0), z: new Float64Array(0),
      valid: new Uint8Array(0), cell: new Int32Array(0), intervalInside: new Uint8Array(0), fields: none,
    };
  }
  const s = new Float64Array(n), x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n);
  const valid = new Uint8Array(n), cell = new Int32Array(n).fill(-1);
  const fields = template.map((f): SampledField => ({ ...f, columns: f.columns.map(() => new Float64Array(n)) }));
  for (let i = 0; i < n; i++) {
    const t = i / (n - 1);
    s[i] = t * length;
    x[i] = t === 1 ? to[0] : from[0] + t * dx; y[i] = t === 1 ? to[1] : from[1] + t * dy; z[i] = t === 1 ? to[2] : from[2] + t * dz;
    const p = win[i]!;
    // Outside every share: the values of share 0, which wrote NaN there like the single-thread probe.
    const src = parts[p < 0 ? 0 : p]!;
    if (p >= 0) { valid[i] = 1; cell[i] = src.cell[i]!; }
    for (let f = 0; f < fields.length; f++) {
      const cols = fields[f]!.columns, from_ = src.fields[f]!.columns;
      for (let c = 0; c < cols.length; c++) cols[c]![i] = from_[c]![i]!;
    }
  }
  const intervalInside = new Uint8Array(n - 1);
  for (let i = 0; i + 1 < n; i++) intervalInside[i] = valid[i]! & valid[i + 1]!;
  return { from, to, length, mode: 'samples', count: n, validCount, outside: false, s, x, y, z, valid, cell, intervalInside, fields };
}

/** Merges the shares' boundary faces (share order) into the dataset's `BoundaryFaces`; faces two shares both hold cancel. */
export function mergeBoundary(d: Dataset, parts: readonly BoundaryPart[]): BoundaryFaces {
  const merge = parts[0]?.merge;
  if (!merge) throw new Error('worker pool: the first share sent no point merge with its boundary faces');
  const total = parts.reduce((s, b) => s + b.count, 0);
  const table = new FaceTable(total);
  const key = new Int32Array(4);
  for (const b of parts) {
    for (let f = 0; f < b.count; f++) {
      const a = b.offsets[f]!;
      faceKey(b.points, a, b.offsets[f + 1]! - a, null, 0, key);
      table.toggle(key[0]!, key[1]!, key[2]!, key[3]!, b.cell[f]!, b.localFace[f]!);
    }
  }
  const keep = parts.map((b) => new Uint8Array(b.count));
  let count = 0, nodeCount = 0, flippedCancelled = 0;
  parts.forEach((b, p) => {
    for (let f = 0; f < b.count; f++) {
      const a = b.offsets[f]!, m = b.offsets[f + 1]! - a;
      faceKey(b.points, a, m, null, 0, key);
      const s = table.find(key[0]!, key[1]!, key[2]!, key[3]!);
      if (s >= 0 && table.vals[2 * s] === b.cell[f] && table.vals[2 * s + 1] === b.localFace[f]) {
        keep[p]![f] = 1; count++; nodeCount += m;
      } else if (isFlipped(d, b, f)) flippedCancelled++;
    }
  });
  const cell = new Int32Array(count), localFace = new Int32Array(count), piece = new Int32Array(count);
  const offsets = new Int32Array(count + 1), nodes = new Int32Array(nodeCount), points = new Int32Array(nodeCount);
  const areaVector = new Float64Array(3 * count), centroid = new Float64Array(3 * count);
  let o = 0;
  parts.forEach((b, p) => {
    const k = keep[p]!;
    for (let f = 0; f < b.count; f++) {
      if (!k[f]) continue;
      cell[o] = b.cell[f]!; localFace[o] = b.localFace[f]!; piece[o] = b.piece[f]!;
      const a = b.offsets[f]!, m = b.offsets[f + 1]! - a, w = offsets[o]!;
      nodes.set(b.nodes.subarray(a, a + m), w); points.set(b.points.subarray(a, a + m), w);
      offsets[o + 1] = w + m;
      for (let q = 0; q < 3; q++) { areaVector[3 * o + q] = b.areaVector[3 * f + q]!; centroid[3 * o + q] = b.centroid[3 * f + q]!; }
      o++;
    }
  });
  return {
    count, cell, localFace, piece, offsets, nodes, points, areaVector, centroid,
    flipped: parts.reduce((s, b) => s + b.flipped, 0) - flippedCancelled, merge, cellStarts: cellStarts(d),
    cells3d: parts.reduce((s, b) => s + b.cells3d, 0),
  };
}

/** Whether face f of a part was reversed against its table or stream order (its nodes differ from the cell's). */
function isFlipped(d: Dataset, b: BoundaryPart, f: number): boolean {
  const starts = cellStarts(d), k = b.piece[f]!, p = d.pieces[k]!, c = b.cell[f]! - starts[k]!;
  const a = b.offsets[f]!, m = b.offsets[f + 1]! - a;
  const pf = p.polyFaces;
  if (pf && p.cellTypes[c] === 42) {
    const fo = pf.faceOffsets[pf.cellFaceStart[c]! + b.localFace[f]!]!;
    for (let j = 0; j < m; j++) if (b.nodes[a + j] !== pf.faceConnectivity[fo + j]) return true;
    return false;
  }
  return faceNodesDiffer(p.connectivity, p.offsets[c]!, p.cellTypes[c]!, b.localFace[f]!, b.nodes, a, m);
}

function faceNodesDiffer(conn: Int32Array, o: number, t: number, lf: number, nodes: Int32Array, a: number, m: number): boolean {
  const q = FACE_TABLE.first[FACE_TABLE.start[t]! + lf]!;
  for (let j = 0; j < m; j++) if (nodes[a + j] !== conn[o + FACE_TABLE.nodes[q + j]!]) return true;
  return false;
}
