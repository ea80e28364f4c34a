/**
 * Which fields a probe samples, and how one located sample turns into values.
 *
 * A field is named as in the file; `point:NAME` or `cell:NAME` picks the association when a point and a
 * cell array share a name (a bare name prefers point data). By default a probe samples every point
 * field present in all pieces, then every cell field present in all pieces whose name no point field
 * uses. Point data is interpolated with the cell's weights; cell data is the cell's own (constant) value.
 * Values stay in the file's units; a sample outside the mesh gets NaN in every column (and a `valid`
 * flag of 0 in the probe result), never a zero.
 */
import { commonFieldNames, type Dataset } from '../model/dataset.ts';
import type { NumericArray } from '../model/fieldArray.ts';
import { findField } from '../model/piece.ts';
import type { Location } from './locatePoint.ts';

/** A field resolved across the pieces of a dataset. */
export interface ProbeField {
  readonly name: string;
  readonly association: 'point' | 'cell';
  readonly components: number;
  /** Column labels: the name for a scalar, `name_x, name_y, name_z` for 3 components, `name_0 …` otherwise. */
  readonly labels: readonly string[];
  /** The field's values in each piece (index = piece number), tuple-interleaved. */
  readonly perPiece: readonly NumericArray[];
}

/** One sampled field: a Float64Array column per component, one entry per sample (NaN where invalid). */
export interface SampledField {
  readonly name: string;
  readonly association: 'point' | 'cell';
  readonly components: number;
  readonly labels: readonly string[];
  readonly columns: Float64Array[];
}

/** Column labels of a field with `components` components. */
export function columnLabels(name: string, components: number): string[] {
  if (components === 1) return [name];
  if (components === 3) return [`${name}_x`, `${name}_y`, `${name}_z`];
  return Array.from({ length: components }, (_, c) => `${name}_${c}`);
}

/**
 * Resolves field names (see the file comment for the syntax and the default set); throws naming the
 * missing field and listing what the dataset has.
 */
export function resolveProbeFields(d: Dataset, names?: readonly string[]): ProbeField[] {
  const pointNames = commonFieldNames(d, 'point'), cellNames = commonFieldNames(d, 'cell');
  const wanted: [string, 'point' | 'cell'][] = [];
  if (!names) {
    for (const n of pointNames) wanted.push([n, 'point']);
    for (const n of cellNames) if (!pointNames.includes(n)) wanted.push([n, 'cell']);
  } else {
    for (const raw of names) {
      const m = /^(point|cell):(.*)$/.exec(raw);
      const name = m ? m[2]! : raw;
      const assoc = m ? (m[1] as 'point' | 'cell') : pointNames.includes(name) ? 'point' : 'cell';
      if (!(assoc === 'point' ? pointNames : cellNames).includes(name)) {
        throw new Error(`probe: no ${m ? assoc + ' ' : ''}field "${name}" in every piece of ${d.source} (point fields: ${pointNames.join(', ') || 'none'}; cell fields: ${cellNames.join(', ') || 'none'})`);
      }
      if (!wanted.some(([n, a]) => n === name && a === assoc)) wanted.push([name, assoc]);
    }
  }
  return wanted.map(([name, association]) => {
    const perPiece = d.pieces.map((p) => findField(p, name, association)!);
    const components = perPiece[0]!.components;
    for (let k = 1; k < perPiece.length; k++) {
      if (perPiece[k]!.components !== components) {
        throw new Error(`probe: ${association} field "${name}" has ${components} components in piece 0 but ${perPiece[k]!.components} in piece ${k}`);
      }
    }
    return { name, association, components, labels: columnLabels(name, components), perPiece: perPiece.map((f) => f.values) };
  });
}

/** Allocates the sampled columns for `count` samples. */
export function allocateColumns(fields: readonly ProbeField[], count: number): SampledField[] {
  return fields.map((f) => ({
    name: f.name, association: f.association, components: f.components, labels: f.labels,
    columns: Array.from({ length: f.components }, () => new Float64Array(count)),
  }));
}

/** Writes the values of sample `i` at location `loc` (NaN in every column when `loc.cell` < 0). */
export function writeSample(fields: readonly ProbeField[], out: readonly SampledField[], i: number, loc: Location): void {
  for (let f = 0; f < fields.length; f++) {
    const field = fields[f]!, cols = out[f]!.columns, nc = field.components;
    if (loc.cell < 0) { for (let c = 0; c < nc; c++) cols[c]![i] = NaN; continue; }
    const v = field.perPiece[loc.piece]!;
    if (field.association === 'cell') {
      const b = loc.localCell * nc;
      for (let c = 0; c < nc; c++) cols[c]![i] = v[b + c]!;
    } else {
      const ids = loc.ids, w = loc.weights, n = loc.count;
      for (let c = 0; c < nc; c++) {
        let s = 0;
        for (let k = 0; k < n; k++) s += w[k]! * v[ids[k]! * nc + c]!;
        cols[c]![i] = s;
      }
    }
  }
}
