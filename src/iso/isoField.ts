/**
 * The scalar an iso-surface is drawn for, as one value per point of every piece.
 *
 * A field is named as everywhere else: its name in the file (or a derived field's name, attached by the
 * caller through `withDerivedFields`), with an optional `point:`/`cell:` prefix when a point and a cell array
 * share a name. A vector field gives its Euclidean magnitude; one component is picked by the column-label
 * suffix of the line and point probes (`velocity_x`, `velocity_y`, `velocity_z`, or `name_0`, `name_1`, …).
 *
 * Cell data is carried to the points as the unweighted mean of the cells around each point (common
 * practice; cells of other dimensions than the most common one around a point count alike). The
 * surface is then the iso-surface of that point field.
 */
import { commonFieldNames, type Dataset } from '../model/dataset.ts';
import type { FieldArray, NumericArray } from '../model/fieldArray.ts';
import { findField, pointCount, type Piece } from '../model/piece.ts';

/** A field spec resolved on a dataset. */
export interface ScalarSource {
  /** The spec as given (e.g. `velocity_x`). */
  readonly spec: string;
  /** The file's (or derived) array name. */
  readonly name: string;
  readonly association: 'point' | 'cell';
  /** Component index, or −1 for the magnitude of a vector (0 for a scalar). */
  readonly component: number;
  /** Components of the array. */
  readonly components: number;
  /** Human-readable: `p`, `|velocity|`, `velocity_x`, `p (cell data averaged to points)`. */
  readonly label: string;
}

const SUFFIX = /^(.*)_(x|y|z|\d+)$/;

/**
 * Resolves `spec` on `d`. Throws a one-line error naming the spec and the fields present when it matches
 * no array held by every piece, or names a component the array does not have.
 */
export function resolveScalar(d: Dataset, spec: string): ScalarSource {
  const want = spec.startsWith('point:') ? 'point' : spec.startsWith('cell:') ? 'cell' : undefined;
  const bare = want ? spec.slice(want.length + 1) : spec;
  const pointNames = commonFieldNames(d, 'point'), cellNames = commonFieldNames(d, 'cell');
  const lookup = (name: string): 'point' | 'cell' | undefined => {
    if (want) return (want === 'point' ? pointNames : cellNames).includes(name) ? want : undefined;
    return pointNames.includes(name) ? 'point' : cellNames.includes(name) ? 'cell' : undefined;
  };
  const first = d.pieces[0];
  const arrayOf = (name: string, a: 'point' | 'cell'): FieldArray => findField(first!, name, a)!;
  const direct = first ? lookup(bare) : undefined;
  if (direct) {
    const f = arrayOf(bare, direct);
    return describe(spec, bare, direct, f.components === 1 ? 0 : -1, f.components);
  }
  const m = SUFFIX.exec(bare);
  if (m && first) {
    const base = m[1]!, a = lookup(base);
    if (a) {
      const f = arrayOf(base, a), s = m[2]!;
      const c = s === 'x' ? 0 : s === 'y' ? 1 : s === 'z' ? 2 : Number(s);
      if (c >= f.components) throw new Error(`iso field "${spec}": "${base}" has ${f.components} component${f.components === 1 ? '' : 's'}, expected a component below ${f.components}`);
      return describe(spec, base, a, c, f.components);
    }
  }
  const known = [...pointNames, ...cellNames.filter((n) => !pointNames.includes(n)).map((n) => (pointNames.includes(n) ? `cell:${n}` : n))];
  throw new Error(`iso field "${spec}": no such field in ${d.source}; expected one of ${known.join(', ') || '(no fields)'} (a vector by magnitude, or NAME_x/_y/_z for a component)`);
}

function describe(spec: string, name: string, association: 'point' | 'cell', component: number, components: number): ScalarSource {
  const base = components === 1 ? name : component < 0 ? `|${name}|` : `${name}_${components === 3 ? 'xyz'[component] : component}`;
  return { spec, name, association, component, components, label: association === 'cell' ? `${base} (cell data averaged to points)` : base };
}

/** One value per tuple of `f`: the component, or the magnitude when `component` is −1. */
export function scalarOf(values: NumericArray, components: number, component: number, tuples: number): Float64Array {
  const out = new Float64Array(tuples);
  if (components === 1) { for (let i = 0; i < tuples; i++) out[i] = values[i]!; return out; }
  for (let i = 0, b = 0; i < tuples; i++, b += components) {
    if (component >= 0) { out[i] = values[b + component]!; continue; }
    let s = 0;
    for (let c = 0; c < components; c++) { const x = values[b + c]!; s += x * x; }
    out[i] = Math.sqrt(s);
  }
  return out;
}

/** The scalar at every point of piece `p` (cell data averaged to the points; points in no cell get NaN). */
export function pointScalars(p: Piece, src: ScalarSource): Float64Array {
  const f = findField(p, src.name, src.association)!;
  const np = pointCount(p);
  if (src.association === 'point') return scalarOf(f.values, f.components, src.component, np);
  const nc = p.cellTypes.length, cellVal = scalarOf(f.values, f.components, src.component, nc);
  const sum = new Float64Array(np), count = new Int32Array(np);
  const conn = p.connectivity, off = p.offsets, pf = p.polyFaces;
  for (let c = 0; c < nc; c++) {
    let a = off[c]!, b = off[c + 1]!, ids = conn;
    if (a === b && pf) { ids = pf.faceConnectivity; a = pf.faceOffsets[pf.cellFaceStart[c]!]!; b = pf.faceOffsets[pf.cellFaceStart[c + 1]!]!; }
    const v = cellVal[c]!;
    for (let q = a; q < b; q++) {
      const id = ids[q]!;
      // A face stream repeats nodes; count each node once per cell.
      let seen = false;
      for (let r = a; r < q && !seen; r++) if (ids[r] === id) seen = true;
      if (!seen) { sum[id] += v; count[id]++; }
    }
  }
  for (let i = 0; i < np; i++) sum[i] = count[i]! > 0 ? sum[i]! / count[i]! : NaN;
  return sum;
}
