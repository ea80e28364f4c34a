/**
 * A dataset whose arrays live in shared memory (`SharedArrayBuffer`), so every compute worker reads the same
 * bytes: posting the dataset to a worker clones the small objects around the arrays and shares the arrays.
 *
 * Where a platform has no shared memory (a browser page that is not cross-origin isolated), `sharedMemory()`
 * is false and the pool runs one worker holding its own copy.
 */
import type { Dataset } from '../model/dataset.ts';
import type { FieldArray, NumericArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';

/** Whether this context can create `SharedArrayBuffer`s that workers can share (Node: always; browser: when cross-origin isolated). */
export function sharedMemory(): boolean {
  if (typeof SharedArrayBuffer === 'undefined') return false;
  const g = globalThis as { crossOriginIsolated?: boolean; process?: unknown };
  return g.crossOriginIsolated === true || g.process !== undefined;
}

type Typed = NumericArray;

/** `a` itself when it already views shared memory, else a copy of it in a fresh `SharedArrayBuffer`. */
export function toSharedArray<T extends Typed>(a: T): T {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const ctor = a.constructor as new (b: SharedArrayBuffer, o: number, n: number) => T;
  const out = new ctor(new SharedArrayBuffer(a.byteLength), 0, a.length);
  out.set(a as never);
  return out;
}

const sharedFields = (fs: readonly FieldArray[]): FieldArray[] => fs.map((f) => ({ ...f, values: toSharedArray(f.values) }));

function sharedPiece(p: Piece): Piece {
  const pf = p.polyFaces;
  return {
    points: toSharedArray(p.points), cellTypes: toSharedArray(p.cellTypes), offsets: toSharedArray(p.offsets),
    connectivity: toSharedArray(p.connectivity),
    ...(pf ? { polyFaces: { cellFaceStart: toSharedArray(pf.cellFaceStart), faceOffsets: toSharedArray(pf.faceOffsets), faceConnectivity: toSharedArray(pf.faceConnectivity) } } : {}),
    pointData: sharedFields(p.pointData), cellData: sharedFields(p.cellData),
  };
}

/**
 * The dataset with every mesh and field array in shared memory (copied once; arrays already shared are
 * kept). The copy replaces the original: drop the original to free its memory.
 */
export function toSharedDataset(d: Dataset): Dataset {
  return { ...d, pieces: d.pieces.map(sharedPiece), fieldData: sharedFields(d.fieldData) };
}

/** Bytes of the mesh and field arrays of a dataset (what the shared copy occupies). */
export function datasetBytes(d: Dataset): number {
  let n = 0;
  const f = (fs: readonly FieldArray[]) => { for (const x of fs) n += x.values.byteLength; };
  for (const p of d.pieces) {
    n += p.points.byteLength + p.cellTypes.byteLength + p.offsets.byteLength + p.connectivity.byteLength;
    if (p.polyFaces) n += p.polyFaces.cellFaceStart.byteLength + p.polyFaces.faceOffsets.byteLength + p.polyFaces.faceConnectivity.byteLength;
    f(p.pointData); f(p.cellData);
  }
  f(d.fieldData);
  return n;
}
