/**
 * Fields on a cut: point fields interpolated linearly along each cut edge from the vertex provenance the
 * cut records; cell fields copied from each triangle's source cell (constant over the cell's part of the
 * cut). Only the fields asked for are built, so the cut itself stays field-agnostic and a view can ask for
 * another colour field later without cutting again.
 */
import { cellStarts, commonFieldNames, pieceOfCell, pointStarts, type Dataset } from '../model/dataset.ts';
import type { FieldArray, NumericArray } from '../model/fieldArray.ts';
import { findField } from '../model/piece.ts';
import type { SurfaceField } from './triangleSet.ts';

/** A field of the dataset by name and association. */
export interface FieldRef {
  readonly name: string;
  readonly association: 'point' | 'cell';
}

/** The cut geometry `interpolateCutFields` needs (see `PlaneCut` for the layout). */
export interface CutProvenance {
  readonly indices: Uint32Array;
  readonly sourceCell: Int32Array;
  readonly vertexEdges: Int32Array;
  readonly vertexT: Float64Array;
}

/**
 * Every field present in all pieces of the dataset with the same component count, point fields first.
 * Fields whose component count differs between pieces are left out.
 */
export function allFieldRefs(d: Dataset): FieldRef[] {
  const out: FieldRef[] = [];
  for (const association of ['point', 'cell'] as const) {
    for (const name of commonFieldNames(d, association)) {
      const nc = d.pieces.map((p) => findField(p, name, association)!.components);
      if (nc.every((c) => c === nc[0])) out.push({ name, association });
    }
  }
  return out;
}

/** The per-piece arrays of a field, or throws naming the field and the first piece that lacks it. */
function pieceArrays(d: Dataset, ref: FieldRef): { arrays: NumericArray[]; components: number } {
  const arrays: NumericArray[] = [];
  let components = -1;
  d.pieces.forEach((p, k) => {
    const f: FieldArray | undefined = findField(p, ref.name, ref.association);
    if (!f) throw new Error(`cut: ${ref.association} field "${ref.name}" is missing in piece ${k} of ${d.source}`);
    if (components >= 0 && f.components !== components) {
      throw new Error(`cut: ${ref.association} field "${ref.name}" has ${f.components} components in piece ${k}, ${components} in piece 0`);
    }
    components = f.components;
    arrays.push(f.values);
  });
  return { arrays, components: Math.max(components, 1) };
}

/** The fields `spec` names on `d` ('all': `allFieldRefs(d)`, 'none': none) with their component counts; throws as `interpolateCutFields` does for a missing field. */
export function cutFieldLayout(d: Dataset, spec: 'all' | 'none' | readonly FieldRef[]): { name: string; association: 'point' | 'cell'; components: number }[] {
  const refs = spec === 'all' ? allFieldRefs(d) : spec === 'none' ? [] : spec;
  return refs.map((r) => ({ name: r.name, association: r.association, components: pieceArrays(d, r).components }));
}

/**
 * Writes field `ref` of a cut's vertices v0 … v1 − 1 (point field) or triangles t0 … t1 − 1 (cell field) into
 * `out` from tuple `o`: the values `pointFieldOnCut` / `cellFieldOnCut` give there, bit for bit (a pool worker
 * writes them straight into the merged cut's shared arrays).
 */
export function cutFieldInto(d: Dataset, cut: CutProvenance, ref: FieldRef, v0: number, v1: number, t0: number, t1: number, out: Float64Array, o: number): void {
  const { arrays, components: nc } = pieceArrays(d, ref);
  if (ref.association === 'point') {
    interpolateVertices(arrays, nc, pointStarts(d), cut.vertexEdges.subarray(2 * v0, 2 * v1), cut.vertexT.subarray(v0, v1), out.subarray(nc * o, nc * (o + v1 - v0)));
  } else {
    copyCells(arrays, nc, cellStarts(d), cut.sourceCell.subarray(t0, t1), out.subarray(nc * o, nc * (o + t1 - t0)));
  }
}

/** Materialises fields on a cut. `spec` 'all' means `allFieldRefs(d)`; 'none' gives no fields. */
export function interpolateCutFields(d: Dataset, cut: CutProvenance, spec: 'all' | 'none' | readonly FieldRef[]): SurfaceField[] {
  const refs = spec === 'all' ? allFieldRefs(d) : spec === 'none' ? [] : spec;
  return refs.map((r) => (r.association === 'point' ? pointFieldOnCut(d, cut, r.name) : cellFieldOnCut(d, cut, r.name)));
}

/** A point field interpolated to the cut's vertices: (1 − t)·f[a] + t·f[b] per component. */
export function pointFieldOnCut(d: Dataset, cut: CutProvenance, name: string): SurfaceField {
  const { arrays, components: nc } = pieceArrays(d, { name, association: 'point' });
  const out = new Float64Array(cut.vertexT.length * nc);
  interpolateVertices(arrays, nc, pointStarts(d), cut.vertexEdges, cut.vertexT, out);
  return { name, association: 'point', components: nc, values: out };
}

/**
 * The loop of `pointFieldOnCut`, on its own so that nothing follows it: an optimised loop entered on the first
 * large cut of a session is kept when the loop ends instead of being thrown away by the code after it.
 */
function interpolateVertices(arrays: NumericArray[], nc: number, ps: Int32Array, e: Int32Array, tt: Float64Array, out: Float64Array): void {
  const nv = tt.length, single = arrays.length === 1;
  for (let v = 0; v < nv; v++) {
    let a = e[2 * v]!, b = e[2 * v + 1]!, vals = arrays[0]!;
    if (!single) { const k = pieceOfCell(ps, a); vals = arrays[k]!; a -= ps[k]!; b -= ps[k]!; }
    const t = tt[v]!, s = 1 - t, ia = a * nc, ib = b * nc, o = v * nc;
    if (t === 0) for (let c = 0; c < nc; c++) out[o + c] = vals[ia + c]!;
    else for (let c = 0; c < nc; c++) out[o + c] = s * vals[ia + c]! + t * vals[ib + c]!;
  }
}

/** A cell field copied to the cut's triangles from their source cells. */
export function cellFieldOnCut(d: Dataset, cut: CutProvenance, name: string): SurfaceField {
  const { arrays, components: nc } = pieceArrays(d, { name, association: 'cell' });
  const out = new Float64Array(cut.sourceCell.length * nc);
  copyCells(arrays, nc, cellStarts(d), cut.sourceCell, out);
  return { name, association: 'cell', components: nc, values: out };
}

/** The loop of `cellFieldOnCut`: each triangle's tuple from its source cell (`cs`: cellStarts). */
function copyCells(arrays: NumericArray[], nc: number, cs: Int32Array, sc: Int32Array, out: Float64Array): void {
  const nt = sc.length, single = arrays.length === 1;
  for (let t = 0; t < nt; t++) {
    let g = sc[t]!, vals = arrays[0]!;
    if (!single) { const k = pieceOfCell(cs, g); vals = arrays[k]!; g -= cs[k]!; }
    for (let c = 0, i = g * nc, o = t * nc; c < nc; c++) out[o + c] = vals[i + c]!;
  }
}
