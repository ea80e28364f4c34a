/**
 * A dataset in SI units: when a probe set declares the file's length unit or a field's unit as something
 * other than SI, the probes run on a converted copy (coordinates × length factor, each declared field ×
 * its factor), so every number they produce is SI. A file already in SI is used as it is (no copy).
 * Copies are cached per dataset and unit declaration, so re-evaluating a set does not copy again.
 */
import type { Dataset } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import type { UnitsDoc } from './probeSet.ts';
import { unitDef } from './units.ts';

/** Conversion factors to SI of a unit declaration. */
export interface SiFactors {
  /** Metres per file length unit. */
  length: number;
  /** Factor per declared field name (only those ≠ 1). */
  fields: Record<string, number>;
}

/** Factors of a (checked) unit declaration; unknown units throw (the document checker refuses them first). */
export function siFactors(units: UnitsDoc | undefined): SiFactors {
  const length = units?.length === undefined ? 1 : factorOf(units.length, 'units.length');
  const fields: Record<string, number> = {};
  for (const [name, u] of Object.entries(units?.fields ?? {})) {
    const f = factorOf(u, `units.fields.${name}`);
    if (f !== 1) fields[name] = f;
  }
  return { length, fields };
}

function factorOf(u: string, where: string): number {
  const d = unitDef(u);
  if (!d) throw new Error(`${where}: unknown unit "${u}"`);
  return d.factor;
}

const cache = new WeakMap<Dataset, Map<string, Dataset>>();
/** Scaled coordinates by source array and factor, so steps of a series that share a mesh share the SI mesh too. */
const scaledPoints = new WeakMap<Float64Array, Map<number, Float64Array>>();

function pointsInSi(points: Float64Array, factor: number): Float64Array {
  if (factor === 1) return points;
  let m = scaledPoints.get(points);
  if (!m) { m = new Map(); scaledPoints.set(points, m); }
  let out = m.get(factor);
  if (!out) { out = scaled(points, factor); m.set(factor, out); }
  return out;
}

function scaled(values: FieldArray['values'], factor: number): Float64Array {
  const out = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) out[i] = values[i]! * factor;
  return out;
}

function convertFields(list: readonly FieldArray[], factors: Record<string, number>): FieldArray[] {
  return list.map((f) => {
    const k = factors[f.name];
    return k === undefined ? f : { ...f, values: scaled(f.values, k), sourceType: 'Float64' };
  });
}

/** The dataset in SI (the same object when nothing needs converting). Field data (dataset level) is converted too. */
export function siDataset(d: Dataset, factors: SiFactors): Dataset {
  const names = Object.keys(factors.fields).sort();
  if (factors.length === 1 && names.length === 0) return d;
  const key = `${factors.length}|${names.map((n) => `${n}=${factors.fields[n]}`).join('|')}`;
  let byKey = cache.get(d);
  const hit = byKey?.get(key);
  if (hit) return hit;
  const pieces: Piece[] = d.pieces.map((p) => ({
    ...p,
    points: pointsInSi(p.points, factors.length),
    pointData: convertFields(p.pointData, factors.fields),
    cellData: convertFields(p.cellData, factors.fields),
  }));
  const out: Dataset = { ...d, pieces, fieldData: convertFields(d.fieldData, factors.fields) };
  if (d.assembled && factors.length !== 1) {
    const b = d.assembled.bounds, k = factors.length;
    (out as { assembled: Dataset['assembled'] }).assembled = { ...d.assembled, bounds: [b[0] * k, b[1] * k, b[2] * k, b[3] * k, b[4] * k, b[5] * k] };
  }
  if (!byKey) { byKey = new Map(); cache.set(d, byKey); }
  byKey.set(key, out);
  return out;
}
