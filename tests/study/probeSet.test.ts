/**
 * The probe-set document: a set round-trips through save and load unchanged; a version-1 file (committed
 * in fixtures/) loads and upgrades to the same probes; malformed documents are refused with errors that
 * say where, what was expected and what was found.
 * Reference: the format's own definition (src/study/probeSet.ts, probeSet.schema.json, probeSetV1.ts).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DocumentError } from '../../src/study/checkValues.ts';
import { PROBE_SET_VERSION, type ProbeSet } from '../../src/study/probeSet.ts';
import { canonicalProbeSet, readProbeSet, writeProbeSet } from '../../src/study/probeSetFile.ts';

const FIXTURES = join(__dirname, 'fixtures');
const fixture = (name: string) => readFileSync(join(FIXTURES, name), 'utf8');

/** Parses a document given as an object; returns the error (or fails when none is thrown). */
function refuse(doc: unknown): DocumentError {
  try {
    readProbeSet(typeof doc === 'string' ? doc : JSON.stringify(doc), 'case.json');
  } catch (e) {
    expect(e).toBeInstanceOf(DocumentError);
    return e as DocumentError;
  }
  throw new Error('the document was accepted');
}

const valid = (): ProbeSet => JSON.parse(fixture('pipe-stations.v2.json')) as ProbeSet;

describe('probe set: save and load', () => {
  it('round-trips: load → save → load gives the same document, and save is stable', () => {
    const { set, fromVersion } = readProbeSet(fixture('pipe-stations.v2.json'), 'pipe-stations.v2.json');
    expect(fromVersion).toBe(2);
    expect(set).toEqual(valid());
    const text = writeProbeSet(set);
    const again = readProbeSet(text).set;
    expect(again).toEqual(set);
    expect(writeProbeSet(again)).toBe(text);
    // every probe keeps its id, kind, label and geometry
    expect(again.probes.map((p) => `${p.id}:${p.kind}`)).toEqual(['mid:cut-plane', 'core:cut-plane', 'diameter:line', 'wall-normal:line',
      'centre:point', 'inlet-face:force', 'loss:pressure-loss', 'balance:mass-balance']);
  });

  it('writes number arrays on one line without touching text that looks like one', () => {
    const set = valid();
    set.description = 'stations at [1,  2] and [\n3] mm';
    const text = writeProbeSet(set);
    expect(text).toContain('"origin": [0, 0, 0.05]');
    expect(readProbeSet(text).set.description).toBe('stations at [1,  2] and [\n3] mm');
  });

  it('writes members in the schema order whatever order the object has', () => {
    const set = valid();
    const shuffled = { probes: set.probes.map((p) => ({ geometry: p.geometry, kind: p.kind, id: p.id, ...(p.label ? { label: p.label } : {}) })), version: 2, format: set.format } as unknown as ProbeSet;
    const text = writeProbeSet(shuffled);
    expect(Object.keys(JSON.parse(text))).toEqual(['format', 'version', 'probes']);
    expect(Object.keys(canonicalProbeSet(shuffled).probes[0]!)).toEqual(['id', 'kind', 'label', 'geometry']);
  });

  it('keeps surface-group labels keyed by the group\'s file name, between formulas and probes', () => {
    const set = { ...valid(), groupLabels: { 'zone 3': 'left outlet', wall: 'hull' } } as ProbeSet;
    const text = writeProbeSet(set);
    expect(Object.keys(JSON.parse(text)).slice(-2)).toEqual(['groupLabels', 'probes']);
    expect(readProbeSet(text, 'labels.json').set.groupLabels).toEqual({ 'zone 3': 'left outlet', wall: 'hull' });
    expect(() => readProbeSet(JSON.stringify({ ...set, groupLabels: { wall: '' } }), 'labels.json')).toThrow(/groupLabels\.wall/);
  });

  it('a version-1 file (fixtures/pipe-stations.v1.json) loads and upgrades to version 2 with the same meaning', () => {
    const { set, fromVersion } = readProbeSet(fixture('pipe-stations.v1.json'), 'pipe-stations.v1.json');
    expect(fromVersion).toBe(1);
    expect(set.version).toBe(PROBE_SET_VERSION);
    expect(set.title).toMatch(/^Coolant pipe stations/);
    expect(set.units).toEqual({ length: 'm' });
    expect(set.reference).toEqual({
      density: 998.207, viscosity: 0.0010016, speed: 0.05, area: 3.14159265e-4, length: 0.02, pressure: 0,
      dragDirection: [0, 0, 1], liftDirection: [1, 0, 0], momentPoint: [0, 0, 0.05],
    });
    expect(set.probes).toEqual([
      { id: 'mid', label: 'Mid station', kind: 'cut-plane', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] }, fields: { density: 998.207 } },
      { id: 'diameter', label: 'Diameter at 70 mm', kind: 'line', geometry: { from: [-0.0099, 0, 0.07], to: [0.0099, 0, 0.07] }, options: { samples: 41 } },
      { id: 'centre', label: 'Centre line at 30 mm', kind: 'point', geometry: { at: [0, 0, 0.03] } },
      { id: 'inlet-face', label: 'Inlet face', kind: 'force', geometry: { surfaces: [0] } },
    ]);
    // the upgraded set is a valid current-version document and round-trips
    expect(readProbeSet(writeProbeSet(set)).set).toEqual(set);
  });
});

describe('probe set: malformed documents are refused with a clear error', () => {
  it('text that is not JSON: says so with the line and column', () => {
    const e = refuse('{\n  "format": "fieldtally-probe-set",\n  "version": 2,\n  "probes": [,]\n}');
    expect(e.message).toMatch(/^case\.json: document: expected JSON text, found text that is not JSON at line 4, column 14 /);
  });

  it('not a probe set, or an unknown version', () => {
    expect(refuse([1, 2]).message).toBe('case.json: document: expected a probe-set object ({"format": "fieldtally-probe-set", …}), found [1,2]');
    expect(refuse({ format: 'other-tool', version: 2, probes: [] }).message).toMatch(/^case\.json: format: expected "fieldtally-probe-set" \(this is not a fieldtally probe set\), found "other-tool"$/);
    expect(refuse({ format: 'fieldtally-probe-set', version: 3, probes: [] }).message).toMatch(/version: expected a version this fieldtally reads \(1 or 2\); version 3 is newer — update fieldtally, found 3$/);
    expect(refuse({ format: 'fieldtally-probe-set', version: '2', probes: [] }).message).toMatch(/version: expected a version this fieldtally reads \(1 or 2\), found "2"$/);
  });

  it('a missing or unknown member, with its path', () => {
    const noProbes = refuse({ format: 'fieldtally-probe-set', version: 2 });
    expect(noProbes.message).toBe('case.json: probes: expected a value (required), found nothing');
    const s = valid() as unknown as { probes: Record<string, unknown>[] };
    s.probes[2]!['colour'] = 'red';
    expect(refuse(s).message).toBe('case.json: probes[2].colour: expected one of the members id, kind, label, geometry, fields, options, pin, found an unknown member "colour"');
  });

  it('a wrong value deep in a probe: path, expected and found', () => {
    const s = valid();
    (s.probes[0]!.geometry as { normal: unknown }).normal = [0, 0];
    expect(refuse(s).message).toBe('case.json: probes[0].geometry.normal: expected an array of 3 finite numbers [x, y, z], found [0,0]');
    const t = valid();
    (t.probes[1]!.geometry as { region: { disk: { radius: number } } }).region.disk.radius = -1;
    expect(refuse(t).message).toBe('case.json: probes[1].geometry.region.disk.radius: expected a number > 0, found -1');
    const u = valid();
    ((u.probes[2] as { options?: unknown }).options as { samples: number }).samples = 2.5;
    expect(refuse(u).message).toBe('case.json: probes[2].options.samples: expected a whole number, found 2.5');
  });

  it('an unknown kind, unit or preset', () => {
    const s = valid() as unknown as { probes: { kind: string }[] };
    s.probes[4]!.kind = 'probe-point';
    expect(refuse(s).message).toMatch(/^case\.json: probes\[4\]\.kind: expected one of "cut-plane", "line", "point", "force", "pressure-loss", "mass-balance", "wall", "iso", found "probe-point"$/);
    const u = valid();
    u.units = { fields: { p: 'kg/m3', T: 'degC' } };
    const e = refuse(u);
    expect(e.issues).toHaveLength(2);
    expect(e.issues[0]).toEqual({ path: 'units.fields.p', expected: expect.stringMatching(/^a unit as the catalogue writes it \(1, m, mm/), found: '"kg/m3" (write it "kg/m³")' });
    expect(e.issues[1]!.found).toMatch(/"degC", an offset unit/);
    const r = valid();
    r.reference = { preset: 'water-25c' };
    expect(refuse(r).message).toBe('case.json: reference.preset: expected one of "water-20c", "air-isa-sea-level", found "water-25c"');
  });

  it('rules beyond the schema: duplicate ids, a zero normal, a line whose ends coincide', () => {
    const s = valid();
    s.probes[3]!.id = 'mid';
    expect(refuse(s).message).toBe('case.json: probes[3].id: expected an id not used before (probes[0] has it), found "mid"');
    const t = valid();
    (t.probes[0]!.geometry as { normal: number[] }).normal = [0, 0, 0];
    expect(refuse(t).message).toBe('case.json: probes[0].geometry.normal: expected a non-zero vector, found [0,0,0]');
    const u = valid();
    (u.probes[2]!.geometry as { to: number[] }).to = [-0.0099, 0, 0.07];
    expect(refuse(u).message).toBe('case.json: probes[2].geometry.to: expected an end point different from "from", found [-0.0099,0,0.07]');
  });

  it('lists every problem, not only the first', () => {
    const s = valid() as unknown as { probes: Record<string, unknown>[]; title: unknown };
    s.title = 7;
    s.probes[0]!['id'] = 'has space';
    delete s.probes[5]!['geometry'];
    const e = refuse(s);
    expect(e.issues.map((i) => i.path)).toEqual(['title', 'probes[0].id', 'probes[5].geometry']);
    expect(e.message).toMatch(/\(and 2 more problems\)$/);
    expect(e.details.split('\n')).toHaveLength(3);
  });

  it('a malformed version-1 file is refused too', () => {
    const v1 = JSON.parse(fixture('pipe-stations.v1.json')) as { probes: Record<string, unknown>[] };
    v1.probes[0]!['type'] = 'disk';
    expect(refuse(v1).message).toBe('case.json: probes[0].type: expected one of "plane", "line", "point", "force", found "disk"');
  });
});
