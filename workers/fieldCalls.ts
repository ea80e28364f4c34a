/**
 * The worker's calls for the app's derived fields, formulas and wall quantities (`attachFields`,
 * `wallSurface` of workers/api.ts). Pure functions of the held dataset: the worker entry keeps the state.
 */
import { withDerivedFields, type DeriveOptions } from '../src/derive/derivedFields.ts';
import { withFormulaFields } from '../src/derive/formulaFields.ts';
import type { Dataset } from '../src/model/dataset.ts';
import { fieldSiUnit } from '../src/study/units.ts';
import type { BoundaryFaces } from '../src/surface/boundaryFaces.ts';
import type { FaceList } from '../src/surface/surfaceDrawing.ts';
import { facesOfGroups, type SurfaceGroups } from '../src/surface/surfaceGroups.ts';
import { selectionVertexValues } from '../src/surface/wallDrawing.ts';
import { wallQuantities } from '../src/surface/wallQuantities.ts';
import type { FieldsReply, FieldsRequest, WallReply, WallRequest } from './api.ts';

/** Largest number of y⁺ thresholds and histogram bins a request may ask for. */
const MAX_THRESHOLDS = 20;
const MAX_BINS = 200;

const positive = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x) && x > 0;

/** Checks a fields request at the edge; throws one line naming the member. */
function checkFieldsRequest(r: FieldsRequest): void {
  if (!Array.isArray(r.derived) || r.derived.some((n) => typeof n !== 'string')) throw new Error('attach fields: "derived" must be a list of derived field names');
  if (!Array.isArray(r.formulas) || r.formulas.some((f) => typeof f?.name !== 'string' || typeof f.expression !== 'string' || (f.unit !== undefined && typeof f.unit !== 'string'))) {
    throw new Error('attach fields: "formulas" must be a list of {name, expression, unit?} with text values');
  }
  for (const [k, v] of Object.entries(r.reference ?? {})) {
    if (v !== undefined && (typeof v !== 'number' || !Number.isFinite(v))) throw new Error(`attach fields: reference ${k} must be a finite number, got ${JSON.stringify(v)}`);
  }
}

/**
 * `base` (the file's own arrays) with the requested derived fields, then the formulas, attached one by
 * one; each that fails is left out with its message (so the others still work).
 */
export function attachFields(base: Dataset, r: FieldsRequest): { dataset: Dataset } & Omit<FieldsReply, 'description'> {
  checkFieldsRequest(r);
  const ref = r.reference ?? {};
  const derive: Partial<DeriveOptions> = {
    ...(positive(ref.density) ? { density: ref.density } : {}),
    reference: {
      ...(ref.density !== undefined ? { density: ref.density } : {}), ...(ref.speed !== undefined ? { speed: ref.speed } : {}),
      ...(ref.pressure !== undefined ? { pressure: ref.pressure } : {}),
    },
  };
  const failed: FieldsReply['failed'] = [];
  let d = base;
  for (const name of r.derived) {
    try { d = withDerivedFields(d, [name], derive); } catch (e) { failed.push({ name, message: (e as Error).message.split('\n')[0]! }); }
  }
  const formulaUnits: Record<string, string> = {};
  const ctx = {
    reference: { density: ref.density, viscosity: ref.viscosity, speed: ref.speed, pressure: ref.pressure, area: ref.area, length: ref.length },
    unitOf: (name: string) => formulaUnits[name] ?? fieldSiUnit(name, {}),
    derive,
  };
  for (const f of r.formulas) {
    try {
      const out = withFormulaFields(d, [f], ctx);
      d = out.dataset;
      Object.assign(formulaUnits, out.units);
    } catch (e) { failed.push({ name: f.name, message: (e as Error).message.split('\n')[0]! }); }
  }
  return { dataset: d, formulaUnits, failed };
}

/** Checks a wall request at the edge; throws one line naming the member and what was expected. */
function checkWallRequest(r: WallRequest, groupCount: number): void {
  if (!Array.isArray(r.groups) || r.groups.length === 0 || r.groups.some((g) => !Number.isInteger(g) || g < 0 || g >= groupCount)) {
    throw new Error(`wall quantities: "groups" must list surface group indices 0 … ${groupCount - 1}, got ${JSON.stringify(r.groups)}`);
  }
  if (!['shear', 'cf', 'yplus'].includes(r.quantity)) throw new Error(`wall quantities: quantity must be shear, cf or yplus, got ${JSON.stringify(r.quantity)}`);
  for (const k of ['density', 'speed', 'viscosity'] as const) if (!positive(r[k])) throw new Error(`wall quantities: ${k} must be a positive number, got ${JSON.stringify(r[k])}`);
  if (!Array.isArray(r.thresholds) || r.thresholds.length > MAX_THRESHOLDS || r.thresholds.some((t) => typeof t !== 'number' || !Number.isFinite(t) || t < 0)) {
    throw new Error(`wall quantities: y+ thresholds must be up to ${MAX_THRESHOLDS} numbers ≥ 0, got ${JSON.stringify(r.thresholds)}`);
  }
  if (!Number.isInteger(r.bins) || r.bins < 1 || r.bins > MAX_BINS) throw new Error(`wall quantities: histogram bins must be a whole number 1 … ${MAX_BINS}, got ${JSON.stringify(r.bins)}`);
  if (r.wallDistance !== 'cell-centroid' && r.wallDistance !== 'first-node') throw new Error(`wall quantities: wall distance must be cell-centroid or first-node, got ${JSON.stringify(r.wallDistance)}`);
  if (!['auto', 'wall-shear', 'gradient'].includes(r.shearFrom)) throw new Error(`wall quantities: shear source must be auto, wall-shear or gradient, got ${JSON.stringify(r.shearFrom)}`);
}

/** Wall quantities on the request's groups of the boundary `faces` (drawn in `drawn` order: the same faces). */
export function wallSurface(d: Dataset, faces: BoundaryFaces, groups: SurfaceGroups, drawn: FaceList, r: WallRequest): WallReply {
  checkWallRequest(r, groups.groups.length);
  const selection = facesOfGroups(groups, r.groups);
  const w = wallQuantities(d, faces, selection, {
    density: r.density, speed: r.speed, viscosity: r.viscosity, thresholds: [...r.thresholds], bins: r.bins,
    wallDistance: r.wallDistance, source: r.shearFrom, loads: { wallGradient: 'second-order' },
  }, groups.faceSurfaceCell);
  const perFace = r.quantity === 'shear' ? w.perFace.shearMagnitude : r.quantity === 'cf' ? w.perFace.cf : w.perFace.yPlus;
  if (!perFace) throw new Error(`wall quantities: ${r.quantity === 'cf' ? 'c_f' : 'y+'} could not be computed (${w.notes.join('; ')})`);
  const s = w.shearSource;
  const shearSource = s.method === 'wall-shear-array' ? `the file's wall-shear array "${s.array}"`
    : `the ${s.gradient ?? 'first-order'} velocity gradient of "${s.array}" with μ = ${typeof s.mu === 'number' ? `${Number(s.mu.toPrecision(6))} Pa·s` : `"${s.mu}"`}`;
  return {
    values: selectionVertexValues(drawn, selection, perFace), shearSource, wallDistanceDefinition: w.wallDistanceDefinition,
    faces: w.faces, area: w.area,
    stats: { shear: w.stats.shearMagnitude, cf: w.stats.cf, yPlus: w.stats.yPlus },
    yPlusAbove: w.yPlusAbove, yPlusHistogram: w.yPlusHistogram, notes: w.notes,
  };
}
