/**
 * Units of formula values as exponents of the SI base units (m, kg, s, K), for the SI unit labels the
 * unit catalogue (src/study/units.ts) uses. An unknown unit (`undeclared`) propagates as unknown.
 */

/** Exponents of m, kg, s, K; null when unknown. */
export type Dims = readonly [number, number, number, number] | null;

const TABLE: readonly (readonly [string, readonly [number, number, number, number]])[] = [
  ['1', [0, 0, 0, 0]], ['m', [1, 0, 0, 0]], ['m²', [2, 0, 0, 0]], ['m³', [3, 0, 0, 0]], ['m/s', [1, 0, -1, 0]],
  ['m/s²', [1, 0, -2, 0]], ['Pa', [-1, 1, -2, 0]], ['kg/m³', [-3, 1, 0, 0]], ['Pa·s', [-1, 1, -1, 0]], ['m²/s', [2, 0, -1, 0]],
  ['m²/s²', [2, 0, -2, 0]], ['m²/s³', [2, 0, -3, 0]], ['1/s', [0, 0, -1, 0]], ['1/s²', [0, 0, -2, 0]], ['K', [0, 0, 0, 1]],
  ['N', [1, 1, -2, 0]], ['N·m', [2, 1, -2, 0]], ['kg/s', [0, 1, -1, 0]], ['m³/s', [3, 0, -1, 0]], ['W', [2, 1, -3, 0]],
  ['W/m²', [0, 1, -3, 0]], ['kg', [0, 1, 0, 0]], ['s', [0, 0, 1, 0]],
];

/** The SI unit labels a formula may declare as its unit. */
export const FORMULA_UNIT_LABELS: readonly string[] = TABLE.map(([u]) => u);

/** Dimensions of an SI unit label, or null for an unknown one. */
export function dimsOf(unit: string | undefined): Dims {
  if (unit === undefined) return null;
  return TABLE.find(([u]) => u === unit)?.[1] ?? null;
}

/** The SI label of dimensions: a catalogue label when one matches, else `m^a·kg^b·s^c·K^d`; `undeclared` when unknown. */
export function unitOfDims(d: Dims): string {
  if (!d) return 'undeclared';
  const hit = TABLE.find(([, x]) => x.every((v, i) => Math.abs(v - d[i]!) < 1e-12));
  if (hit) return hit[0];
  const parts = ['m', 'kg', 's', 'K'].map((s, i) => (d[i] === 0 ? '' : d[i] === 1 ? s : `${s}^${Number(d[i]!.toPrecision(6))}`)).filter(Boolean);
  return parts.join('·');
}

export const sameDims = (a: Dims, b: Dims): boolean => !a || !b || a.every((v, i) => Math.abs(v - b[i]!) < 1e-12);
export const addDims = (a: Dims, b: Dims, sign = 1): Dims => (a && b ? [a[0] + sign * b[0], a[1] + sign * b[1], a[2] + sign * b[2], a[3] + sign * b[3]] : null);
export const scaleDims = (a: Dims, k: number): Dims => (a ? [a[0] * k, a[1] * k, a[2] * k, a[3] * k] : null);
export const isDimensionless = (a: Dims): boolean => !a || a.every((v) => Math.abs(v) < 1e-12);
