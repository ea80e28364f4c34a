/**
 * Fields on an iso-surface. Point fields are interpolated along the subdivision edge each vertex lies on,
 * (1 − t)·f[end0] + t·f[end1], where an end point is a mesh point or a cell's vertex mean (the mean of the
 * field over the cell's distinct nodes, as the subdivision defines it). Cell fields are copied to each
 * triangle from its source cell by the cut's own routine.
 */
import { cellFieldOnCut } from '../cut/cutFields.ts';
import type { SurfaceField } from '../cut/triangleSet.ts';
import { cellStarts, pieceOfCell, pointStarts, type Dataset } from '../model/dataset.ts';
import type { NumericArray } from '../model/fieldArray.ts';
import { findField } from '../model/piece.ts';

/** Vertex provenance of a welded iso-surface (layout as in `RawIso`, one entry per welded vertex). */
export interface IsoProvenance {
  readonly ends: Int32Array;
  readonly t: Float64Array;
  readonly sourceCell: Int32Array;
  readonly indices: Uint32Array;
}

function arraysOf(d: Dataset, name: string, association: 'point' | 'cell'): { arrays: NumericArray[]; components: number } {
  const arrays: NumericArray[] = [];
  let components = -1;
  d.pieces.forEach((p, k) => {
    const f = findField(p, name, association);
    if (!f) throw new Error(`iso: ${association} field "${name}" is missing in piece ${k} of ${d.source}`);
    if (components >= 0 && f.components !== components) throw new Error(`iso: ${association} field "${name}" has ${f.components} components in piece ${k}, ${components} in piece 0`);
    components = f.components;
    arrays.push(f.values);
  });
  return { arrays, components: Math.max(components, 1) };
}

/** A point field (all its components) at every vertex of the surface. */
export function pointFieldOnIso(d: Dataset, prov: IsoProvenance, name: string): SurfaceField {
  const { arrays, components: nc } = arraysOf(d, name, 'point');
  const ps = pointStarts(d), cs = cellStarts(d), nv = prov.t.length, out = new Float64Array(nv * nc);
  const a = new Float64Array(nc), b = new Float64Array(nc);
  const valueAt = (end: number, into: Float64Array): void => {
    if (end >= 0) {
      const k = arrays.length === 1 ? 0 : pieceOfCell(ps, end), i = (end - ps[k]!) * nc, vals = arrays[k]!;
      for (let c = 0; c < nc; c++) into[c] = vals[i + c]!;
      return;
    }
    // A cell's vertex mean: the mean over its distinct nodes.
    const g = -1 - end, k = arrays.length === 1 ? 0 : pieceOfCell(cs, g), cell = g - cs[k]!, p = d.pieces[k]!, vals = arrays[k]!;
    let s = p.offsets[cell]!, e = p.offsets[cell + 1]!, ids = p.connectivity;
    const pf = p.polyFaces;
    if (s === e && pf) { ids = pf.faceConnectivity; s = pf.faceOffsets[pf.cellFaceStart[cell]!]!; e = pf.faceOffsets[pf.cellFaceStart[cell + 1]!]!; }
    into.fill(0);
    let count = 0;
    for (let q = s; q < e; q++) {
      const id = ids[q]!;
      let seen = false;
      for (let r = s; r < q && !seen; r++) if (ids[r] === id) seen = true;
      if (seen) continue;
      for (let c = 0; c < nc; c++) into[c] += vals[id * nc + c]!;
      count++;
    }
    for (let c = 0; c < nc; c++) into[c] /= count;
  };
  for (let v = 0; v < nv; v++) {
    const t = prov.t[v]!;
    valueAt(prov.ends[2 * v]!, a);
    if (t === 0) { for (let c = 0; c < nc; c++) out[v * nc + c] = a[c]!; continue; }
    valueAt(prov.ends[2 * v + 1]!, b);
    for (let c = 0; c < nc; c++) out[v * nc + c] = (1 - t) * a[c]! + t * b[c]!;
  }
  return { name, association: 'point', components: nc, values: out };
}

/** A cell field (all its components) on every triangle, from its source cell. */
export function cellFieldOnIso(d: Dataset, prov: IsoProvenance, name: string): SurfaceField {
  arraysOf(d, name, 'cell');
  return cellFieldOnCut(d, { indices: prov.indices, sourceCell: prov.sourceCell, vertexEdges: new Int32Array(0), vertexT: new Float64Array(0) }, name);
}
