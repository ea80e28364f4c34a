/**
 * The JSON Schema in the repo (src/study/probeSet.schema.json) and the hand-written checker
 * (src/study/probeSetCheck.ts) describe the same document: the members of every object are the same
 * lists, the enumerations are the catalogue's, and both give the same verdict on a set of valid and
 * invalid documents. The schema is walked by a small checker written here for the keywords it uses
 * (JSON Schema 2020-12 semantics, test-only). Rules the schema cannot state — unique ids, non-zero
 * vectors, distinct line ends — are listed and checked to be the checker's alone.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { MEMBERS, checkProbeSet } from '../../src/study/probeSetCheck.ts';
import { FLUID_PRESETS, LENGTH_UNITS, UNIT_CATALOGUE } from '../../src/study/units.ts';

type Schema = Record<string, unknown>;
const SCHEMA = JSON.parse(readFileSync(join(__dirname, '../../src/study/probeSet.schema.json'), 'utf8')) as Schema;
const DEFS = SCHEMA['$defs'] as Record<string, Schema>;
const FIXTURE = JSON.parse(readFileSync(join(__dirname, 'fixtures/pipe-stations.v2.json'), 'utf8')) as Record<string, unknown>;

const KNOWN = new Set(['$schema', '$id', '$ref', '$defs', 'title', 'description', 'type', 'properties', 'required', 'additionalProperties',
  'items', 'minItems', 'maxItems', 'enum', 'const', 'oneOf', 'anyOf', 'allOf', 'minimum', 'maximum', 'exclusiveMinimum', 'exclusiveMaximum',
  'pattern', 'minLength', 'maxLength']);

const typeOf = (v: unknown): string => (v === null ? 'null' : Array.isArray(v) ? 'array' : Number.isInteger(v) ? 'integer' : typeof v);
const deepEq = (a: unknown, b: unknown): boolean => JSON.stringify(a) === JSON.stringify(b);

/** True when `v` satisfies schema `s` (the subset of 2020-12 the probe-set schema uses). */
function conforms(s: Schema, v: unknown): boolean {
  for (const k of Object.keys(s)) if (!KNOWN.has(k)) throw new Error(`schema keyword "${k}" is not handled by the test checker`);
  if (typeof s['$ref'] === 'string') {
    const name = (s['$ref'] as string).replace('#/$defs/', '');
    if (!DEFS[name]) throw new Error(`dangling $ref ${s['$ref']}`);
    if (!conforms(DEFS[name]!, v)) return false;
  }
  if (s['type'] !== undefined) {
    const t = typeOf(v);
    if (!(s['type'] === t || (s['type'] === 'number' && t === 'integer'))) return false;
  }
  if (s['const'] !== undefined && !deepEq(s['const'], v)) return false;
  if (Array.isArray(s['enum']) && !s['enum'].some((e) => deepEq(e, v))) return false;
  if (typeof v === 'number') {
    if (typeof s['minimum'] === 'number' && v < s['minimum']) return false;
    if (typeof s['maximum'] === 'number' && v > s['maximum']) return false;
    if (typeof s['exclusiveMinimum'] === 'number' && v <= s['exclusiveMinimum']) return false;
    if (typeof s['exclusiveMaximum'] === 'number' && v >= s['exclusiveMaximum']) return false;
  }
  if (typeof v === 'string') {
    if (typeof s['minLength'] === 'number' && [...v].length < s['minLength']) return false;
    if (typeof s['maxLength'] === 'number' && [...v].length > s['maxLength']) return false;
    if (typeof s['pattern'] === 'string' && !new RegExp(s['pattern'], 'u').test(v)) return false;
  }
  if (Array.isArray(v)) {
    if (typeof s['minItems'] === 'number' && v.length < s['minItems']) return false;
    if (typeof s['maxItems'] === 'number' && v.length > s['maxItems']) return false;
    if (s['items'] && !v.every((x) => conforms(s['items'] as Schema, x))) return false;
  }
  if (typeOf(v) === 'object') {
    const o = v as Record<string, unknown>, props = (s['properties'] ?? {}) as Record<string, Schema>;
    if (Array.isArray(s['required']) && !s['required'].every((k) => o[k as string] !== undefined)) return false;
    for (const [k, x] of Object.entries(o)) {
      if (props[k]) { if (!conforms(props[k]!, x)) return false; } else if (s['additionalProperties'] === false) return false;
      else if (typeof s['additionalProperties'] === 'object' && !conforms(s['additionalProperties'] as Schema, x)) return false;
    }
  }
  if (Array.isArray(s['allOf']) && !s['allOf'].every((x) => conforms(x as Schema, v))) return false;
  if (Array.isArray(s['anyOf']) && !s['anyOf'].some((x) => conforms(x as Schema, v))) return false;
  if (Array.isArray(s['oneOf']) && s['oneOf'].filter((x) => conforms(x as Schema, v)).length !== 1) return false;
  return true;
}

const checkerAccepts = (doc: unknown): boolean => { try { checkProbeSet(doc); return true; } catch { return false; } };
const clone = (): Record<string, any> => structuredClone(FIXTURE);

/** Documents both must accept. */
const VALID: [string, () => unknown][] = [
  ['the pipe fixture', () => clone()],
  ['an empty set', () => ({ format: 'fieldtally-probe-set', version: 2, probes: [] })],
  ['air preset, mm and kPa', () => ({ format: 'fieldtally-probe-set', version: 2, units: { length: 'mm', fields: { p: 'kPa', U: 'mm/s' } }, reference: { preset: 'air-isa-sea-level' }, probes: [] })],
  ['a rectangle region and cell groups', () => { const d = clone(); d['probes'][0].geometry.region = { rectangle: { centre: [0, 0, 0.05], axis: [1, 0, 0], halfSizes: [0.002, 0.003] }, cellGroups: { field: 'zone', ids: [1, 2] } }; return d; }],
  ['a force with every option', () => { const d = clone(); d['probes'][5].options = { featureAngle: 30, groupArray: false, viscous: 'gradient', kinematicPressure: true, wallShearSign: -1, reference: { speed: 2 } }; d['probes'][5].fields = { pressure: 'p', viscosity: 'mu' }; return d; }],
  ['a balance of surfaces only', () => { const d = clone(); d['probes'][7].geometry = { planes: [], surfaces: ['inlet', 2] }; return d; }],
  ['surfaces chosen by name, box, nearest point and area', () => { const d = clone(); d['probes'][5].geometry.surfaces = [{ name: 'wall' }, { within: [0, 1, 0, 1, 0, 1], areaFrom: 0.1, areaTo: 2 }, { nearest: [0, 0, 0.05] }]; return d; }],
  ['surface groups relabelled by name', () => ({ format: 'fieldtally-probe-set', version: 2, groupLabels: { 'zone 3': 'left outlet', 'part 2': 'hull' }, probes: [] })],
  ['null field roles and a density field', () => { const d = clone(); d['probes'][0].fields = { velocity: null, pressure: null, density: 'rho' }; return d; }],
];

/** Documents both must refuse. */
const INVALID: [string, (d: Record<string, any>) => void][] = [
  ['wrong format', (d) => { d['format'] = 'other'; }],
  ['version 1 shape under version 2', (d) => { d['version'] = 1; }],
  ['an unknown top-level member', (d) => { d['comment'] = 'x'; }],
  ['a group label that is no string', (d) => { d['groupLabels'] = { inlet: 3 }; }],
  ['an empty group label', (d) => { d['groupLabels'] = { inlet: '' }; }],
  ['group labels as a list', (d) => { d['groupLabels'] = ['inlet']; }],
  ['probes not an array', (d) => { d['probes'] = {}; }],
  ['an unknown kind', (d) => { d['probes'][0].kind = 'plane'; }],
  ['a member of another kind', (d) => { d['probes'][2].geometry.origin = [0, 0, 0]; }],
  ['a vector of two numbers', (d) => { d['probes'][0].geometry.normal = [0, 1]; }],
  ['a string in a vector', (d) => { d['probes'][4].geometry.at = [0, '0', 0]; }],
  ['a bad id', (d) => { d['probes'][1].id = '-core'; }],
  ['a missing geometry', (d) => { delete d['probes'][3].geometry; }],
  ['a negative radius', (d) => { d['probes'][1].geometry.region.disk.radius = -0.001; }],
  ['a zero density constant', (d) => { d['probes'][0].fields.density = 0; }],
  ['too few samples', (d) => { d['probes'][2].options.samples = 1; }],
  ['a fractional sample count', (d) => { d['probes'][2].options.samples = 10.5; }],
  ['a tolerance too large', (d) => { d['probes'][2].options.tolerance = 0.01; }],
  ['an unknown spacing', (d) => { d['probes'][3].options.spacing = 'uniform'; }],
  ['edge fraction 1', (d) => { d['probes'][3].options.boundaryLayer.edgeFraction = 1; }],
  ['an empty surface list', (d) => { d['probes'][5].geometry.surfaces = []; }],
  ['a fractional surface id', (d) => { d['probes'][5].geometry.surfaces = [1.5]; }],
  ['a selector member unknown', (d) => { d['probes'][5].geometry.surfaces = [{ largest: true }]; }],
  ['a box of five numbers', (d) => { d['probes'][5].geometry.surfaces = [{ within: [0, 1, 0, 1, 0] }]; }],
  ['a negative area limit', (d) => { d['probes'][5].geometry.surfaces = [{ areaFrom: -1 }]; }],
  ['an unknown viscous method', (d) => { d['probes'][5].options.viscous = 'les'; }],
  ['a wall-shear sign of 2', (d) => { d['probes'][5].options = { wallShearSign: 2 }; }],
  ['a balance with nothing in it', (d) => { d['probes'][7].geometry.planes = []; }],
  ['an unknown loss option', (d) => { d['probes'][6].options.reference = 'upstream'; }],
  ['an unknown unit', (d) => { d['units'].fields.p = 'furlong'; }],
  ['a unit spelled otherwise', (d) => { d['units'].fields.p = 'Pa.s'; }],
  ['a length unit that is not a length', (d) => { d['units'].length = 'Pa'; }],
  ['an unknown preset', (d) => { d['reference'].preset = 'oil'; }],
  ['a negative reference speed', (d) => { d['reference'].speed = -1; }],
  ['a label too long', (d) => { d['probes'][0].label = 'x'.repeat(201); }],
  ['a title that is a number', (d) => { d['title'] = 3; }],
  ['a region member unknown', (d) => { d['probes'][1].geometry.region.circle = {}; }],
];

/** Rules only the checker states (JSON Schema cannot): the schema accepts these, the checker refuses them. */
const CHECKER_ONLY: [string, (d: Record<string, any>) => void][] = [
  ['duplicate probe ids', (d) => { d['probes'][1].id = 'mid'; }],
  ['a zero plane normal', (d) => { d['probes'][0].geometry.normal = [0, 0, 0]; }],
  ['a zero drag direction', (d) => { d['reference'].dragDirection = [0, 0, 0]; }],
  ['an empty group selector', (d) => { d['probes'][5].geometry.surfaces = [{}]; }],
  ['a box whose min exceeds its max', (d) => { d['probes'][5].geometry.surfaces = [{ within: [1, 0, 0, 1, 0, 1] }]; }],
  ['areaFrom above areaTo', (d) => { d['probes'][5].geometry.surfaces = [{ areaFrom: 2, areaTo: 1 }]; }],
  ['a line whose ends coincide', (d) => { d['probes'][2].geometry.to = d['probes'][2].geometry.from; }],
];

describe('probe-set schema and checker agree', () => {
  it('every schema keyword is one the test checker handles, and every $ref resolves', () => {
    const walk = (s: unknown): void => {
      if (Array.isArray(s)) { s.forEach(walk); return; }
      if (typeof s !== 'object' || s === null) return;
      expect(conforms(s as Schema, undefined) || true).toBe(true);
      for (const [k, v] of Object.entries(s)) if (k !== 'enum' && k !== 'const') walk(k === 'properties' || k === '$defs' ? Object.values(v as object) : v);
    };
    walk(SCHEMA);
  });

  it('lists exactly the members the checker accepts, object by object', () => {
    const props = (s: Schema) => Object.keys((s['properties'] ?? {}) as object).sort();
    expect(props(SCHEMA)).toEqual([...MEMBERS.document].sort());
    for (const [name, members] of Object.entries(MEMBERS)) {
      if (name === 'document') continue;
      expect(DEFS[name], `$defs.${name}`).toBeDefined();
      expect(props(DEFS[name]!), `$defs.${name}`).toEqual([...members].sort());
      expect(DEFS[name]!['additionalProperties'], `$defs.${name} is closed`).toBe(false);
    }
    // every object definition of the schema is covered by MEMBERS
    const objects = Object.entries(DEFS).filter(([, s]) => s['type'] === 'object' && s['properties']).map(([n]) => n).sort();
    expect(objects).toEqual(Object.keys(MEMBERS).filter((n) => n !== 'document').sort());
  });

  it('uses the unit catalogue, the length units and the presets of src/study/units.ts', () => {
    expect(DEFS['unit']!['enum']).toEqual(UNIT_CATALOGUE.map((u) => u.symbol));
    expect(DEFS['lengthUnit']!['enum']).toEqual([...LENGTH_UNITS]);
    expect((DEFS['reference']!['properties'] as Record<string, Schema>)['preset']!['enum']).toEqual(FLUID_PRESETS.map((p) => p.id));
  });

  for (const [name, make] of VALID) {
    it(`both accept: ${name}`, () => {
      const d = make();
      expect(conforms(SCHEMA, d)).toBe(true);
      expect(checkerAccepts(d)).toBe(true);
    });
  }

  for (const [name, spoil] of INVALID) {
    it(`both refuse: ${name}`, () => {
      const d = clone();
      spoil(d);
      expect(conforms(SCHEMA, d)).toBe(false);
      expect(checkerAccepts(d)).toBe(false);
    });
  }

  for (const [name, spoil] of CHECKER_ONLY) {
    it(`only the checker refuses (beyond JSON Schema): ${name}`, () => {
      const d = clone();
      spoil(d);
      expect(conforms(SCHEMA, d)).toBe(true);
      expect(checkerAccepts(d)).toBe(false);
    });
  }
});
