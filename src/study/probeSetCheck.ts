/**
 * Checks a version-2 probe-set document by hand, member by member, mirroring `probeSet.schema.json`
 * (no schema library): the members each object may hold are listed once in `MEMBERS`, keyed by the
 * schema's `$defs` names, and a test holds the two to the same lists and the same verdicts.
 *
 * Beyond what the schema can say, this checker also refuses: two probes with one id, a zero plane normal,
 * a zero rectangle axis or drag/lift direction, and a line whose two ends coincide.
 */
import { Checks, DocumentError, at } from './checkValues.ts';
import { checkFormula, FORMULA_NAME } from '../derive/formulaFields.ts';
import { dimsOf, FORMULA_UNIT_LABELS } from '../derive/formulaUnits.ts';
import { PROBE_KINDS, PROBE_SET_FORMAT, PROBE_SET_VERSION, type ProbeSet } from './probeSet.ts';
import { FLUID_PRESETS, LENGTH_UNITS, UNIT_CATALOGUE, unitDef, unitProblem } from './units.ts';

/** Members each object of the document may hold, by schema `$defs` name (`document` is the root). */
export const MEMBERS = {
  document: ['format', 'version', 'title', 'description', 'units', 'reference', 'formulas', 'groupLabels', 'probes'],
  formula: ['name', 'expression', 'unit'],
  units: ['length', 'fields'],
  groupSelector: ['name', 'within', 'nearest', 'areaFrom', 'areaTo'],
  reference: ['preset', 'density', 'viscosity', 'speed', 'area', 'length', 'pressure', 'dragDirection', 'liftDirection', 'liftFrom', 'momentPoint'],
  plane: ['origin', 'normal', 'region'],
  region: ['seed', 'disk', 'rectangle', 'cellGroups'],
  disk: ['centre', 'radius'],
  rectangle: ['centre', 'axis', 'halfSizes'],
  cellGroups: ['field', 'ids'],
  pin: ['offset'],
  flowFields: ['velocity', 'pressure', 'density'],
  flowOptions: ['kinematicPressure'],
  sampleFields: ['sample'],
  boundaryLayer: ['velocity', 'edge', 'edgeFraction', 'direction'],
  cutPlaneProbe: ['id', 'kind', 'label', 'geometry', 'fields', 'options', 'pin'],
  lineProbe: ['id', 'kind', 'label', 'geometry', 'fields', 'options', 'pin'],
  lineGeometry: ['from', 'to'],
  lineOptions: ['spacing', 'samples', 'tolerance', 'boundaryLayer'],
  pointProbe: ['id', 'kind', 'label', 'geometry', 'fields', 'options', 'pin'],
  pointGeometry: ['at'],
  pointOptions: ['tolerance'],
  forceProbe: ['id', 'kind', 'label', 'geometry', 'fields', 'options', 'pin'],
  forceGeometry: ['surfaces'],
  forceFields: ['pressure', 'wallShear', 'velocity', 'viscosity'],
  forceOptions: ['featureAngle', 'groupArray', 'viscous', 'kinematicPressure', 'wallShearSign', 'wallGradient', 'reference'],
  pressureLossProbe: ['id', 'kind', 'label', 'geometry', 'fields', 'options', 'pin'],
  lossGeometry: ['upstream', 'downstream'],
  lossOptions: ['kinematicPressure', 'dynamicPressureFrom'],
  massBalanceProbe: ['id', 'kind', 'label', 'geometry', 'fields', 'options', 'pin'],
  balanceGeometry: ['planes', 'surfaces'],
  balanceOptions: ['featureAngle', 'groupArray'],
  wallProbe: ['id', 'kind', 'label', 'geometry', 'fields', 'options', 'pin'],
  wallGeometry: ['surfaces'],
  wallFields: ['wallShear', 'velocity', 'viscosity', 'pressure'],
  wallOptions: ['featureAngle', 'groupArray', 'wallDistance', 'thresholds', 'bins', 'shearFrom', 'wallGradient', 'wallShearSign'],
  isoProbe: ['id', 'kind', 'label', 'geometry', 'fields', 'pin'],
  isoGeometry: ['field', 'value'],
  isoFields: ['colourBy'],
} as const satisfies Record<string, readonly string[]>;

/** Limits shared with the schema. */
export const LIMITS = {
  idPattern: /^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$/,
  textMax: 200,
  samplesMin: 2,
  samplesMax: 1_000_000,
  toleranceMax: 1e-4,
} as const;

const ID_TEXT = 'an id of 1–64 letters, digits, ".", "_" or "-" starting with a letter or digit';

function units(c: Checks, v: unknown, path: string): void {
  const o = c.object(v, path, MEMBERS.units);
  if (!o) return;
  c.optional(o, 'length', path, (x, p) => {
    const s = c.string(x, p);
    if (s !== undefined && !LENGTH_UNITS.includes(s)) c.fail(p, `a length unit (${LENGTH_UNITS.join(', ')})`, s);
  });
  c.optional(o, 'fields', path, (x, p) => {
    if (typeof x !== 'object' || x === null || Array.isArray(x)) return c.fail(p, 'an object of field name → unit', x);
    for (const [name, u] of Object.entries(x as Record<string, unknown>)) {
      const s = c.string(u, at(p, name));
      if (s === undefined || UNIT_CATALOGUE.some((u) => u.symbol === s)) continue;
      const near = unitDef(s);
      c.issues.push({
        path: at(p, name), expected: `a unit as the catalogue writes it (${UNIT_CATALOGUE.map((u) => u.symbol).join(', ')})`,
        found: near ? `"${s}" (write it "${near.symbol}")` : unitProblem(s)!,
      });
    }
  });
}

function reference(c: Checks, v: unknown, path: string): void {
  const o = c.object(v, path, MEMBERS.reference);
  if (!o) return;
  c.optional(o, 'preset', path, (x, p) => c.oneOf(x, p, FLUID_PRESETS.map((f) => f.id)));
  for (const k of ['density', 'viscosity', 'speed', 'area', 'length'] as const) c.optional(o, k, path, (x, p) => c.number(x, p, { above: 0 }));
  c.optional(o, 'pressure', path, (x, p) => c.number(x, p));
  c.optional(o, 'dragDirection', path, (x, p) => c.vec3(x, p, true));
  c.optional(o, 'liftDirection', path, (x, p) => c.vec3(x, p, true));
  c.optional(o, 'liftFrom', path, (x, p) => c.oneOf(x, p, ['set', 'rule']));
  c.optional(o, 'momentPoint', path, (x, p) => c.vec3(x, p));
  // Coefficients divide by ½ρV²A (and ·L for moments): it must neither overflow nor vanish.
  const { density: rho, speed, area, length } = o as Record<string, unknown>;
  if ([rho, speed, area].every((x) => typeof x === 'number' && x > 0 && Number.isFinite(x))) {
    const q = 0.5 * (rho as number) * (speed as number) ** 2 * (area as number);
    const m = typeof length === 'number' && length > 0 ? q * length : q;
    if (!(Number.isFinite(m) && Number.isFinite(1 / q) && Number.isFinite(1 / m) && m > 0)) {
      c.fail(path, 'reference values whose ½·ρ·V²·A (and ·L) is finite and non-zero', `½·ρ·V²·A = ${q}`);
    }
  }
}

function region(c: Checks, v: unknown, path: string): void {
  const o = c.object(v, path, MEMBERS.region);
  if (!o) return;
  c.optional(o, 'seed', path, (x, p) => c.vec3(x, p));
  c.optional(o, 'disk', path, (x, p) => {
    const d = c.object(x, p, MEMBERS.disk, MEMBERS.disk);
    if (!d) return;
    c.optional(d, 'centre', p, (y, q) => c.vec3(y, q));
    c.optional(d, 'radius', p, (y, q) => c.number(y, q, { above: 0 }));
  });
  c.optional(o, 'rectangle', path, (x, p) => {
    const r = c.object(x, p, MEMBERS.rectangle, MEMBERS.rectangle);
    if (!r) return;
    c.optional(r, 'centre', p, (y, q) => c.vec3(y, q));
    c.optional(r, 'axis', p, (y, q) => c.vec3(y, q, true));
    c.optional(r, 'halfSizes', p, (y, q) => {
      if (!Array.isArray(y) || y.length !== 2) return c.fail(q, 'an array of 2 positive numbers', y);
      y.forEach((z, i) => c.number(z, at(q, i), { above: 0 }));
    });
  });
  c.optional(o, 'cellGroups', path, (x, p) => {
    const g = c.object(x, p, MEMBERS.cellGroups, MEMBERS.cellGroups);
    if (!g) return;
    c.optional(g, 'field', p, (y, q) => c.string(y, q, { minLength: 1 }));
    c.optional(g, 'ids', p, (y, q) => c.array(y, q, (z, r) => c.number(z, r, { integer: true }), 1));
  });
}

function plane(c: Checks, v: unknown, path: string): void {
  const o = c.object(v, path, MEMBERS.plane, ['origin', 'normal']);
  if (!o) return;
  c.optional(o, 'origin', path, (x, p) => c.vec3(x, p));
  c.optional(o, 'normal', path, (x, p) => c.vec3(x, p, true));
  c.optional(o, 'region', path, (x, p) => region(c, x, p));
}

const fieldName = (c: Checks) => (x: unknown, p: string) => c.string(x, p, { minLength: 1 });
const fieldOrNone = (c: Checks) => (x: unknown, p: string) => (x === null ? null : c.string(x, p, { minLength: 1 }) ?? undefined);

function flowFields(c: Checks, v: unknown, path: string): void {
  const o = c.object(v, path, MEMBERS.flowFields);
  if (!o) return;
  c.optional(o, 'velocity', path, fieldOrNone(c));
  c.optional(o, 'pressure', path, fieldOrNone(c));
  c.optional(o, 'density', path, (x, p) => {
    if (x === null || (typeof x === 'string' && x.length > 0)) return;
    if (typeof x === 'number') { c.number(x, p, { above: 0 }); return; }
    c.fail(p, 'a density field name, a positive constant (kg/m³) or null', x);
  });
}

function flowOptions(c: Checks, v: unknown, path: string, members: readonly string[]): Record<string, unknown> | undefined {
  const o = c.object(v, path, members);
  if (o) c.optional(o, 'kinematicPressure', path, (x, p) => c.boolean(x, p));
  return o;
}

function sampleFields(c: Checks, v: unknown, path: string): void {
  const o = c.object(v, path, MEMBERS.sampleFields);
  if (o) c.optional(o, 'sample', path, (x, p) => c.array(x, p, fieldName(c), 1));
}

function tolerance(c: Checks, o: Record<string, unknown>, path: string): void {
  c.optional(o, 'tolerance', path, (x, p) => c.number(x, p, { min: 0, max: LIMITS.toleranceMax }));
}

function grouping(c: Checks, o: Record<string, unknown>, path: string): void {
  c.optional(o, 'featureAngle', path, (x, p) => c.number(x, p, { min: 0, max: 180 }));
  c.optional(o, 'groupArray', path, (x, p) => (x === false ? false : c.string(x, p, { minLength: 1 }) ?? c.fail(p, 'an array name or false', x)));
}

/** A group chosen by what it is (src/surface/groupSelect.ts): at least one criterion; a box with min ≤ max; areas ≥ 0. */
function groupSelector(c: Checks, x: Record<string, unknown>, p: string): unknown {
  const o = c.object(x, p, MEMBERS.groupSelector);
  if (!o) return undefined;
  if (!MEMBERS.groupSelector.some((k) => o[k] !== undefined)) return c.fail(p, `a group selector with at least one of ${MEMBERS.groupSelector.join(', ')}`, x);
  c.optional(o, 'name', p, (y, q) => c.string(y, q, { minLength: 1 }));
  c.optional(o, 'within', p, (y, q) => {
    const b = c.array(y, q, (z, r) => c.number(z, r));
    if (b && (b.length !== 6 || b[0]! > b[1]! || b[2]! > b[3]! || b[4]! > b[5]!)) return c.fail(q, 'a box [xmin, xmax, ymin, ymax, zmin, zmax] with each min ≤ max', y);
    return b;
  });
  c.optional(o, 'nearest', p, (y, q) => c.vec3(y, q));
  c.optional(o, 'areaFrom', p, (y, q) => c.number(y, q, { min: 0 }));
  c.optional(o, 'areaTo', p, (y, q) => c.number(y, q, { min: 0 }));
  if (typeof o['areaFrom'] === 'number' && typeof o['areaTo'] === 'number' && o['areaFrom'] > o['areaTo']) c.fail(at(p, 'areaTo'), `an area ≥ areaFrom (${o['areaFrom']})`, o['areaTo']);
  return x;
}

const surfaceRef = (c: Checks) => (x: unknown, p: string) =>
  (typeof x === 'string' && x.length > 0) || (typeof x === 'number' && Number.isInteger(x)) ? x
    : typeof x === 'object' && x !== null && !Array.isArray(x) ? groupSelector(c, x as Record<string, unknown>, p)
      : c.fail(p, 'a surface group name, whole-number id or selector object', x);

function geometry(c: Checks, kind: string, v: unknown, path: string): void {
  if (kind === 'cut-plane') return plane(c, v, path);
  if (kind === 'line') {
    const o = c.object(v, path, MEMBERS.lineGeometry, MEMBERS.lineGeometry);
    if (!o) return;
    const end = (k: string) => (o[k] === undefined ? undefined : c.vec3(o[k], at(path, k)));
    const a = end('from'), b = end('to');
    if (a && b && a.every((x, i) => x === b[i])) c.fail(at(path, 'to'), 'an end point different from "from"', b);
    return;
  }
  if (kind === 'point') {
    const o = c.object(v, path, MEMBERS.pointGeometry, MEMBERS.pointGeometry);
    if (o) c.optional(o, 'at', path, (x, p) => c.vec3(x, p));
    return;
  }
  if (kind === 'force' || kind === 'wall') {
    const o = c.object(v, path, MEMBERS.forceGeometry, MEMBERS.forceGeometry);
    if (o) c.optional(o, 'surfaces', path, (x, p) => c.array(x, p, surfaceRef(c), 1));
    return;
  }
  if (kind === 'iso') {
    const o = c.object(v, path, MEMBERS.isoGeometry, MEMBERS.isoGeometry);
    if (!o) return;
    c.optional(o, 'field', path, fieldName(c));
    c.optional(o, 'value', path, (x, p) => c.number(x, p));
    return;
  }
  if (kind === 'pressure-loss') {
    const o = c.object(v, path, MEMBERS.lossGeometry, MEMBERS.lossGeometry);
    if (!o) return;
    c.optional(o, 'upstream', path, (x, p) => plane(c, x, p));
    c.optional(o, 'downstream', path, (x, p) => plane(c, x, p));
    return;
  }
  const o = c.object(v, path, MEMBERS.balanceGeometry, ['planes']);
  if (!o) return;
  c.optional(o, 'planes', path, (x, p) => c.array(x, p, (y, q) => { plane(c, y, q); return y; }));
  c.optional(o, 'surfaces', path, (x, p) => c.array(x, p, surfaceRef(c), 1));
  const n = (Array.isArray(o['planes']) ? o['planes'].length : 0) + (Array.isArray(o['surfaces']) ? o['surfaces'].length : 0);
  if (Array.isArray(o['planes']) && n === 0) c.fail(at(path, 'planes'), 'at least one plane or surface in the balance', o['planes']);
}

function fields(c: Checks, kind: string, v: unknown, path: string): void {
  if (kind === 'cut-plane' || kind === 'pressure-loss' || kind === 'mass-balance') return flowFields(c, v, path);
  if (kind === 'line' || kind === 'point') return sampleFields(c, v, path);
  if (kind === 'iso') {
    const o = c.object(v, path, MEMBERS.isoFields);
    if (o) c.optional(o, 'colourBy', path, fieldName(c));
    return;
  }
  const members = kind === 'wall' ? MEMBERS.wallFields : MEMBERS.forceFields;
  const o = c.object(v, path, members);
  if (o) for (const k of members) c.optional(o, k, path, fieldName(c));
}

function options(c: Checks, kind: string, v: unknown, path: string): void {
  if (kind === 'cut-plane') { flowOptions(c, v, path, MEMBERS.flowOptions); return; }
  if (kind === 'pressure-loss') {
    const o = flowOptions(c, v, path, MEMBERS.lossOptions);
    if (o) c.optional(o, 'dynamicPressureFrom', path, (x, p) => c.oneOf(x, p, ['upstream', 'downstream']));
    return;
  }
  if (kind === 'line') {
    const o = c.object(v, path, MEMBERS.lineOptions);
    if (!o) return;
    c.optional(o, 'spacing', path, (x, p) => c.oneOf(x, p, ['even', 'cell-crossings']));
    c.optional(o, 'samples', path, (x, p) => c.number(x, p, { integer: true, min: LIMITS.samplesMin, max: LIMITS.samplesMax }));
    tolerance(c, o, path);
    c.optional(o, 'boundaryLayer', path, (x, p) => {
      const b = c.object(x, p, MEMBERS.boundaryLayer);
      if (!b) return;
      c.optional(b, 'velocity', p, fieldName(c));
      c.optional(b, 'edge', p, (y, q) => c.oneOf(y, q, ['max', 'gradient']));
      c.optional(b, 'edgeFraction', p, (y, q) => c.number(y, q, { above: 0, below: 1 }));
      c.optional(b, 'direction', p, (y, q) => c.vec3(y, q, true));
    });
    return;
  }
  if (kind === 'point') {
    const o = c.object(v, path, MEMBERS.pointOptions);
    if (o) tolerance(c, o, path);
    return;
  }
  if (kind === 'force') {
    const o = c.object(v, path, MEMBERS.forceOptions);
    if (!o) return;
    grouping(c, o, path);
    c.optional(o, 'viscous', path, (x, p) => c.oneOf(x, p, ['auto', 'wall-shear', 'gradient', 'none']));
    c.optional(o, 'kinematicPressure', path, (x, p) => c.boolean(x, p));
    c.optional(o, 'wallShearSign', path, (x, p) => c.oneOf(x, p, [1, -1]));
    c.optional(o, 'wallGradient', path, (x, p) => c.oneOf(x, p, ['second-order', 'first-order']));
    c.optional(o, 'reference', path, (x, p) => reference(c, x, p));
    return;
  }
  if (kind === 'wall') {
    const o = c.object(v, path, MEMBERS.wallOptions);
    if (!o) return;
    grouping(c, o, path);
    c.optional(o, 'wallDistance', path, (x, p) => c.oneOf(x, p, ['cell-centroid', 'first-node']));
    c.optional(o, 'thresholds', path, (x, p) => c.array(x, p, (y, q) => c.number(y, q, { min: 0 }), 1));
    c.optional(o, 'bins', path, (x, p) => c.number(x, p, { integer: true, min: 1, max: 1000 }));
    c.optional(o, 'shearFrom', path, (x, p) => c.oneOf(x, p, ['auto', 'wall-shear', 'gradient']));
    c.optional(o, 'wallGradient', path, (x, p) => c.oneOf(x, p, ['second-order', 'first-order']));
    c.optional(o, 'wallShearSign', path, (x, p) => c.oneOf(x, p, [1, -1]));
    return;
  }
  const o = c.object(v, path, MEMBERS.balanceOptions);
  if (o) grouping(c, o, path);
}

function probe(c: Checks, v: unknown, path: string, ids: Map<string, string>): void {
  if (typeof v !== 'object' || v === null || Array.isArray(v)) { c.fail(path, 'a probe object', v); return; }
  const kind = (v as Record<string, unknown>)['kind'];
  if (!(PROBE_KINDS as readonly unknown[]).includes(kind)) { c.oneOf(kind, at(path, 'kind'), PROBE_KINDS); return; }
  const k = kind as string;
  const o = c.object(v, path, k === 'iso' ? MEMBERS.isoProbe : MEMBERS.cutPlaneProbe, ['id', 'kind', 'geometry'])!;
  const id = o['id'] === undefined ? undefined : c.string(o['id'], at(path, 'id'), { pattern: LIMITS.idPattern, patternText: ID_TEXT });
  if (id !== undefined) {
    const prev = ids.get(id);
    if (prev) c.fail(at(path, 'id'), `an id not used before (${prev} has it)`, id);
    else ids.set(id, path);
  }
  c.optional(o, 'label', path, (x, p) => c.string(x, p, { maxLength: LIMITS.textMax }));
  c.optional(o, 'geometry', path, (x, p) => geometry(c, k, x, p));
  c.optional(o, 'fields', path, (x, p) => fields(c, k, x, p));
  c.optional(o, 'options', path, (x, p) => options(c, k, x, p));
  c.optional(o, 'pin', path, (x, p) => {
    const pin = c.object(x, p, MEMBERS.pin, MEMBERS.pin);
    if (!pin) return;
    c.optional(pin, 'offset', p, (y, q) => {
      if (!Array.isArray(y) || y.length !== 2) return c.fail(q, 'an array of 2 numbers (CSS pixels)', y);
      y.forEach((z, i) => c.number(z, at(q, i), { min: -10000, max: 10000 }));
    });
  });
}

/** A formula: a new field's name and an expression that parses (the parser's message names the column). */
function formula(c: Checks, v: unknown, path: string): void {
  const o = c.object(v, path, MEMBERS.formula, ['name', 'expression']);
  if (!o) return;
  const name = o['name'] === undefined ? undefined : c.string(o['name'], at(path, 'name'), { pattern: FORMULA_NAME, patternText: 'a name of letters, digits, "_", "-" or "." starting with a letter (at most 64)' });
  const expr = o['expression'] === undefined ? undefined : c.string(o['expression'], at(path, 'expression'), { minLength: 1, maxLength: 10000 });
  const unit = o['unit'] === undefined ? undefined : c.string(o['unit'], at(path, 'unit'), { minLength: 1, maxLength: 40 });
  if (unit !== undefined && dimsOf(unit) === null) c.fail(at(path, 'unit'), `an SI unit label (${FORMULA_UNIT_LABELS.join(', ')})`, unit);
  if (name === undefined || expr === undefined) return;
  try { checkFormula({ name, expression: expr }); } catch (e) { c.fail(at(path, 'expression'), `a formula that parses (${(e as Error).message.replace(/^formula "[^"]*": /, '')})`, expr); }
}

/**
 * Checks a parsed version-2 document; returns a deep copy typed as `ProbeSet`, or throws a `DocumentError`
 * listing every issue (`source` names the document in messages).
 */
export function checkProbeSet(doc: unknown, source = 'probe set'): ProbeSet {
  const c = new Checks();
  const o = c.object(doc, '', MEMBERS.document, ['format', 'version', 'probes']);
  if (o) {
    c.optional(o, 'format', '', (x, p) => c.oneOf(x, p, [PROBE_SET_FORMAT]));
    c.optional(o, 'version', '', (x, p) => c.oneOf(x, p, [PROBE_SET_VERSION]));
    c.optional(o, 'title', '', (x, p) => c.string(x, p, { maxLength: LIMITS.textMax }));
    c.optional(o, 'description', '', (x, p) => c.string(x, p));
    c.optional(o, 'units', '', (x, p) => units(c, x, p));
    c.optional(o, 'reference', '', (x, p) => reference(c, x, p));
    c.optional(o, 'formulas', '', (x, p) => c.array(x, p, (y, q) => { formula(c, y, q); return y; }));
    c.optional(o, 'groupLabels', '', (x, p) => {
      if (typeof x !== 'object' || x === null || Array.isArray(x)) return c.fail(p, 'an object of group name → label', x);
      for (const [name, label] of Object.entries(x as Record<string, unknown>)) c.string(label, at(p, name), { minLength: 1, maxLength: LIMITS.textMax });
    });
    const ids = new Map<string, string>();
    c.optional(o, 'probes', '', (x, p) => c.array(x, p, (y, q) => { probe(c, y, q, ids); return y; }));
  }
  if (c.issues.length) throw new DocumentError(source, c.issues);
  return structuredClone(doc) as ProbeSet;
}
