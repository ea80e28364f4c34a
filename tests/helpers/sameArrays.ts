/**
 * Bit-for-bit comparison of two loads of the same file (e.g. one thread against several decoding threads):
 * every typed array of every piece, in a fixed order, by path, type and bytes.
 */
import { expect } from 'vitest';
import type { Dataset } from '../../src/model/dataset.ts';

/** Every typed array of a dataset, in a fixed order, with its path (`0.points`, `0.point.p`, …). */
export function arraysOf(d: Dataset): [string, ArrayBufferView][] {
  const out: [string, ArrayBufferView][] = [];
  d.pieces.forEach((p, k) => {
    out.push([`${k}.points`, p.points], [`${k}.cellTypes`, p.cellTypes], [`${k}.offsets`, p.offsets], [`${k}.connectivity`, p.connectivity]);
    if (p.polyFaces) out.push([`${k}.faceOffsets`, p.polyFaces.faceOffsets], [`${k}.faceConnectivity`, p.polyFaces.faceConnectivity], [`${k}.cellFaceStart`, p.polyFaces.cellFaceStart]);
    for (const f of [...p.pointData, ...p.cellData]) out.push([`${k}.${f.association}.${f.name}`, f.values]);
  });
  return out;
}

const bytesOf = (v: ArrayBufferView) => Buffer.from(v.buffer, v.byteOffset, v.byteLength);

/** Expects `got` to hold the arrays of `want`: same paths, same array types, same bytes. */
export function expectSameArrays(got: Dataset, want: Dataset): void {
  const a = arraysOf(want), b = arraysOf(got);
  expect(b.map(([k]) => k)).toEqual(a.map(([k]) => k));
  for (let i = 0; i < a.length; i++) {
    expect(b[i]![1].constructor, a[i]![0]).toBe(a[i]![1].constructor);
    expect(bytesOf(b[i]![1]).equals(bytesOf(a[i]![1])), a[i]![0]).toBe(true);
  }
}
