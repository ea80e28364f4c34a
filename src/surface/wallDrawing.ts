/**
 * Per-face values of a few boundary faces spread onto the drawn surface: the same fan triangulation and
 * vertex order as `drawFaces` (surfaceDrawing.ts), one value per face on its three-per-triangle vertices,
 * and `NO_VALUE` on every face outside the selection (the view draws those grey).
 */
import type { DrawingValues, FaceList } from './surfaceDrawing.ts';

/** A vertex value meaning "nothing here": larger than any field value a file can hold in 32-bit floats' useful range; drawn grey. */
export const NO_VALUE = 3e38;

/**
 * Values for the drawn surface of `faces`: face `selection[k]` gets `perFace[k]` on all its triangle
 * vertices, other faces `NO_VALUE`. `range` covers the selection's finite values (NaN when none).
 */
export function selectionVertexValues(faces: FaceList, selection: Int32Array, perFace: Float64Array): DrawingValues {
  const at = new Float64Array(faces.count).fill(NaN);
  const picked = new Uint8Array(faces.count);
  for (let k = 0; k < selection.length; k++) { at[selection[k]!] = perFace[k]!; picked[selection[k]!] = 1; }
  let tris = 0;
  for (let f = 0; f < faces.count; f++) tris += Math.max(0, faces.offsets[f + 1]! - faces.offsets[f]! - 2);
  const values = new Float32Array(3 * tris);
  let v = 0, lo = Infinity, hi = -Infinity;
  for (let f = 0; f < faces.count; f++) {
    const m = faces.offsets[f + 1]! - faces.offsets[f]!;
    if (m < 3) continue;
    const x = picked[f] ? at[f]! : NO_VALUE;
    // a face whose value could not be found (NaN) is drawn grey too
    const drawn = Number.isFinite(x) ? x : NO_VALUE;
    if (picked[f] && Number.isFinite(x)) { if (x < lo) lo = x; if (x > hi) hi = x; }
    values.fill(drawn, v, v + 3 * (m - 2));
    v += 3 * (m - 2);
  }
  return { values, range: lo <= hi ? [lo, hi] : [NaN, NaN] };
}
