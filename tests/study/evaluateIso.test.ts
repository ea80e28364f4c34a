/**
 * The iso-surface probe kind in a probe set.
 *  - sample-fields/pipe-medium.vtu (laminar pipe, Hagen–Poiseuille, docs/references.md §1): p = G(L − z) is
 *    linear, so iso p = v is the mesh's cross-section at z = L − v/G, of area mesh volume / L
 *    (sample-fields/README.md); u_z on it runs from 0 at the wall to 2V on the axis.
 *  - a ball r = R on a box given in millimetres: the set converts to SI, so the area is in m² and the
 *    enclosed volume in m³ (4/3·πR³, Archimedes, to the mesh's second-order error).
 *  - the checker refuses a missing field or value, and a report folder lists the probe's numbers.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { datasetOf, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { pipeExact } from '../../src/samples/pipe.ts';
import { evaluateProbeSet } from '../../src/study/evaluate.ts';
import { checkProbeSet } from '../../src/study/probeSetCheck.ts';
import { boxMesh } from '../cut/meshes.ts';

const PIPE = resolve(__dirname, '../../sample-fields/pipe-medium.vtu');
const dir = mkdtempSync(join(tmpdir(), 'fieldtally-isoprobe-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const doc = (probes: unknown[], extra: Record<string, unknown> = {}) => ({ format: 'fieldtally-probe-set', version: 2, ...extra, probes });

it('pipe: area of the cross-section, open, colour statistics with units; shapes and anchor on the surface', async () => {
  const e = pipeExact(), d = await readDataset('pipe-medium.vtu', new Uint8Array(readFileSync(PIPE)));
  const set = checkProbeSet(doc([{ id: 'section', kind: 'iso', geometry: { field: 'p', value: 0.2 }, fields: { colourBy: 'velocity_z' } }]), 'test');
  const ev = evaluateProbeSet(d, set, { keepShapes: true });
  const p = ev.probes[0]!;
  expect(p.ok, p.error ?? '').toBe(true);
  const q = (k: string) => p.quantities.find((x) => x.key === k);
  expect(q('area')!.value / (3.105828541e-5 / e.L)).toBeCloseTo(1, 9);
  expect(q('area')!.unit).toBe('m²');
  expect(q('volume')).toBeUndefined();
  expect(q('pieces')!.value).toBe(1);
  expect(q('boundaryEdges')!.value).toBeGreaterThan(0);
  expect(q('colour.max')!.value).toBeCloseTo(2 * e.V, 12);
  expect(q('colour.max')!.unit).toBe('m/s');
  expect(p.notes.join(' ')).toMatch(/open: \d+ boundary edges/);
  expect(p.definition).toMatch(/^iso-surface p = 0\.2 Pa: each cell split into tetrahedra/);
  const z = e.L - 0.2 / e.G;
  expect(p.anchor![2]).toBeCloseTo(z, 12);
  expect(p.shapes![0]!.kind).toBe('triangles');
});

it('a ball given in millimetres: area in m², enclosed volume in m³; a value outside the range fails with a message', () => {
  const p = boxMesh('tet', 14, 14, 14, 0.2, { m: [100, 0, 0, 0, 100, 0, 0, 0, 100], t: [0, 0, 0] });
  const d = datasetOf([withFields(p, [pointFieldFrom(p, 'r', 1, (x, y, z, o) => { o[0] = Math.hypot(x - 50, y - 50, z - 50); })])]);
  const set = checkProbeSet(doc([
    { id: 'ball', kind: 'iso', geometry: { field: 'r', value: 0.03 } },
    { id: 'none', kind: 'iso', geometry: { field: 'r', value: 5 } },
  ], { units: { length: 'mm', fields: { r: 'mm' } } }), 'test');
  const ev = evaluateProbeSet(d, set);
  const ball = ev.probes[0]!, R = 0.03;
  expect(ball.ok, ball.error ?? '').toBe(true);
  const q = (k: string) => ball.quantities.find((x) => x.key === k)!;
  expect(Math.abs(q('area').value / (4 * Math.PI * R * R) - 1)).toBeLessThan(0.02);
  expect(Math.abs(q('volume').value / ((4 / 3) * Math.PI * R ** 3) - 1)).toBeLessThan(0.04);
  expect(q('volume').unit).toBe('m³');
  expect(ball.notes).toContain('closed: encloses the region where r < 0.03');
  expect(ball.anchor!.every((x) => x > 10 && x < 90)).toBe(true);
  expect(ev.probes[1]!.ok).toBe(false);
  expect(ev.probes[1]!.error).toBe("iso-surface r = 5: no surface: the value is outside the field's range");
});

it('derived fields by name in a probe; the checker refuses what is missing or wrong', async () => {
  const d = await readDataset('pipe-medium.vtu', new Uint8Array(readFileSync(PIPE)));
  const ev = evaluateProbeSet(d, checkProbeSet(doc([{ id: 'w', kind: 'iso', geometry: { field: 'vorticity-magnitude', value: 5 }, fields: { colourBy: 'vorticity_x' } }]), 't'));
  const p = ev.probes[0]!;
  expect(p.ok, p.error ?? '').toBe(true);
  // Poiseuille: |ω| = |du_z/dr| = 4Vr/R² is 5 1/s on the cylinder r = 5R²/(4V) = 2.5 mm, open at both ends.
  expect(p.quantities.find((x) => x.key === 'colour.mean')!.unit).toBe('1/s');
  expect(p.definition).toMatch(/iso-surface vorticity-magnitude = 5 1\/s/);
  const bad = (probe: unknown) => { try { checkProbeSet(doc([probe]), 'bad.json'); return ''; } catch (e) { return (e as Error).message; } };
  expect(bad({ id: 'a', kind: 'iso', geometry: { field: 'p' } })).toBe('bad.json: probes[0].geometry.value: expected a value (required), found nothing');
  expect(bad({ id: 'a', kind: 'iso', geometry: { field: 'p', value: 'high' } })).toMatch(/probes\[0\]\.geometry\.value: expected a (finite )?number/);
  expect(bad({ id: 'a', kind: 'iso', geometry: { field: '', value: 1 } })).toMatch(/probes\[0\]\.geometry\.field/);
  expect(bad({ id: 'a', kind: 'iso', geometry: { field: 'p', value: 1 }, options: {} })).toMatch(/probes\[0\]/);
  expect(bad({ id: 'a', kind: 'iso', geometry: { field: 'p', value: 1 }, fields: { colour: 'p' } })).toMatch(/probes\[0\]\.fields/);
});

it('a report folder lists the iso probe with its units and the caution', async () => {
  const probes = join(dir, 'iso.json');
  writeFileSync(probes, JSON.stringify(doc([{ id: 'section', kind: 'iso', geometry: { field: 'p', value: 0.2 }, fields: { colourBy: 'velocity_z' } }])));
  const out = join(dir, 'report');
  let err = '';
  const code = await main(['report', PIPE, '--probes', probes, '--out', out, '--width', '320', '--height', '240'], { out: () => {}, err: (t) => { err += t; } });
  expect(code, err).toBe(0);
  const csv = readFileSync(join(out, 'results-long.csv'), 'utf8');
  expect(csv).toMatch(/section,.*area.*m²/);
  const json = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
  expect(JSON.stringify(json)).toMatch(/only as good as the simulation/);
});
