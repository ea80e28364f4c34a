/**
 * Boundary faces as a triangle set, so a surface group (an inlet, an outlet, a wall) integrates with the
 * same code as a cut — the mass balance over planes and boundary surfaces uses this.
 *
 * Each selected face is fanned around its vertex mean (symmetric, so a warped quad is split the same way
 * whatever its first node), keeping the face's outward orientation: the triangles' normals point out of the
 * fluid domain, which is the outward normal a mass balance needs. Point fields take the face nodes' values
 * (the centre vertex gets their mean, the value of the linear interpolant on a planar face); cell fields
 * come from the owning cell. Only the type of `BoundaryFaces` is imported; the faces come from the caller.
 */
import { cellStarts, commonFieldNames, pieceOfCell, type Dataset } from '../model/dataset.ts';
import { findField } from '../model/piece.ts';
import type { BoundaryFaces } from '../surface/boundaryFaces.ts';
import type { FieldRef } from './cutFields.ts';
import type { SurfaceField, TriangleSet } from './triangleSet.ts';

/**
 * Triangle set of the boundary faces `selection` (face numbers of `faces`), with the fields `refs`
 * (default: every point and cell field present in all pieces). Positions in the file's length unit.
 */
export function boundaryTriangleSet(d: Dataset, faces: BoundaryFaces, selection: ArrayLike<number>, refs?: readonly FieldRef[]): TriangleSet {
  const list = refs ?? [
    ...commonFieldNames(d, 'point').map((name) => ({ name, association: 'point' as const })),
    ...commonFieldNames(d, 'cell').map((name) => ({ name, association: 'cell' as const })),
  ];
  let nv = 0, nt = 0;
  for (let i = 0; i < selection.length; i++) {
    const f = selection[i]!, m = faces.offsets[f + 1]! - faces.offsets[f]!;
    nv += m + 1; nt += m;
  }
  const positions = new Float64Array(3 * nv), indices = new Uint32Array(3 * nt), sourceCell = new Int32Array(nt);
  const fieldInfo = list.map((r) => {
    const comps = d.pieces.map((p) => findField(p, r.name, r.association)?.components ?? -1);
    if (comps.some((c) => c !== comps[0] || c < 1)) throw new Error(`surface: ${r.association} field "${r.name}" is missing or differs in size between pieces`);
    return { ref: r, nc: comps[0]!, out: new Float64Array((r.association === 'point' ? nv : nt) * comps[0]!) };
  });
  const starts = cellStarts(d);
  let v = 0, t = 0;
  for (let i = 0; i < selection.length; i++) {
    const f = selection[i]!, s = faces.offsets[f]!, m = faces.offsets[f + 1]! - s;
    const k = faces.piece[f]!, piece = d.pieces[k]!, pts = piece.points, g = faces.cell[f]!;
    const local = g - starts[pieceOfCell(starts, g)]!;
    const v0 = v;
    let cx = 0, cy = 0, cz = 0;
    for (let j = 0; j < m; j++) {
      const p = faces.nodes[s + j]!;
      positions[3 * v] = pts[3 * p]!; positions[3 * v + 1] = pts[3 * p + 1]!; positions[3 * v + 2] = pts[3 * p + 2]!;
      cx += pts[3 * p]!; cy += pts[3 * p + 1]!; cz += pts[3 * p + 2]!;
      v++;
    }
    const vc = v++;
    positions[3 * vc] = cx / m; positions[3 * vc + 1] = cy / m; positions[3 * vc + 2] = cz / m;
    const t0 = t;
    for (let j = 0; j < m; j++) {
      indices[3 * t] = vc; indices[3 * t + 1] = v0 + j; indices[3 * t + 2] = v0 + ((j + 1) % m);
      sourceCell[t] = g; t++;
    }
    for (const fi of fieldInfo) {
      const src = findField(piece, fi.ref.name, fi.ref.association)!.values, nc = fi.nc, out = fi.out;
      if (fi.ref.association === 'point') {
        for (let c = 0; c < nc; c++) {
          let sum = 0;
          for (let j = 0; j < m; j++) { const val = src[faces.nodes[s + j]! * nc + c]!; out[(v0 + j) * nc + c] = val; sum += val; }
          out[vc * nc + c] = sum / m;
        }
      } else {
        for (let q = t0; q < t; q++) for (let c = 0; c < nc; c++) out[q * nc + c] = src[local * nc + c]!;
      }
    }
  }
  const fields: SurfaceField[] = fieldInfo.map((fi) => ({ name: fi.ref.name, association: fi.ref.association, components: fi.nc, values: fi.out }));
  return { positions, indices, sourceCell, fields };
}
