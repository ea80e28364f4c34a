/**
 * A field array: one named quantity stored as a flat typed array, tuple-interleaved.
 *
 * Layout: tuple `i`, component `c` is `values[i * components + c]`. The association says whether tuples
 * belong to points or to cells, and is never inferred from the length. Values are in the file's units.
 */

/** Where the tuples of a field belong. `dataset` is VTK's field data: tuples not tied to points or cells. */
export type Association = 'point' | 'cell' | 'dataset';

/** The typed arrays a field may use. 64-bit integers are stored as Float64Array (exact to 2^53, checked at read time). */
export type NumericArray =
  | Float64Array | Float32Array
  | Int32Array | Uint32Array | Int16Array | Uint16Array | Int8Array | Uint8Array;

/** What the file marked the array as (VTK attribute role), if anything. */
export type FieldRole = 'scalars' | 'vectors' | 'normals' | 'tensors' | 'globalIds' | 'pedigreeIds' | 'tcoords';

/** One named quantity. */
export interface FieldArray {
  /** Name as in the file (may contain spaces). */
  readonly name: string;
  readonly association: Association;
  /** Components per tuple (1 scalar, 3 vector, 9 tensor, …). */
  readonly components: number;
  /** Flat values, `tupleCount * components` long. */
  readonly values: NumericArray;
  /** The file's element type name, e.g. `Float32`, `Int64` (for the load report). */
  readonly sourceType: string;
  readonly role?: FieldRole;
}

/** Number of tuples of a field. */
export function tupleCount(f: FieldArray): number {
  return f.components === 0 ? 0 : f.values.length / f.components;
}

/**
 * Range of a field: of its only component for scalars, of the Euclidean magnitude otherwise
 * (the convention VTK uses for a component index of −1). Returns [NaN, NaN] for an empty array.
 */
export function fieldRange(f: FieldArray): [number, number] {
  const v = f.values, nc = f.components, n = tupleCount(f);
  let lo = Infinity, hi = -Infinity;
  if (nc === 1) {
    for (let i = 0; i < n; i++) { const x = v[i]!; if (x < lo) lo = x; if (x > hi) hi = x; }
  } else {
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let c = 0, b = i * nc; c < nc; c++) { const x = v[b + c]!; s += x * x; }
      const m = Math.sqrt(s);
      if (m < lo) lo = m; if (m > hi) hi = m;
    }
  }
  return n === 0 ? [NaN, NaN] : [lo, hi];
}

/** Range of one component of a field. */
export function componentRange(f: FieldArray, component: number): [number, number] {
  const v = f.values, nc = f.components, n = tupleCount(f);
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < n; i++) { const x = v[i * nc + component]!; if (x < lo) lo = x; if (x > hi) hi = x; }
  return n === 0 ? [NaN, NaN] : [lo, hi];
}
