/**
 * The `iso-surface` verb end to end.
 *  - sample-fields/pipe-medium.vtu (laminar pipe, Hagen–Poiseuille, docs/references.md §1): p = G(L − z) is
 *    linear, so the iso-surface p = v is the mesh's cross-section at z = L − v/G: its area equals the cut-plane
 *    area there and the mesh volume over the length (sample-fields/README.md, computed from the geometry);
 *    the section is open along the faceted wall.
 *  - a ball r = R in a generated box written as a .vtu: closed, with its volume (12 cells across: within 8 %); `--out` writes .vtp files our
 *    reader reads back with the same triangles and area.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, expect, it } from 'vitest';
import { main } from '../../../src/cli/main.ts';
import { integratePlane } from '../../../src/cut/planeIntegrals.ts';
import { readDataset } from '../../../src/io/readDataset.ts';
import { writeVtu } from '../../../src/io/writeVtu.ts';
import { datasetOf, pointFieldFrom, withFields } from '../../../src/model/meshBuild.ts';
import { pipeExact } from '../../../src/samples/pipe.ts';
import { triangleAreas } from '../../../src/iso/surfaceMeasures.ts';
import { boxMesh } from '../../cut/meshes.ts';

const FILE = resolve(__dirname, '../../../sample-fields/pipe-medium.vtu');
const dir = mkdtempSync(join(tmpdir(), 'fieldtally-iso-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

it('pipe: iso p is the cross-section (area as the cut-plane and the mesh volume / L), open along the wall', async () => {
  const e = pipeExact();
  const r = await run('iso-surface', FILE, '--field', 'p', '--values', '0.2,0.3', '--colour-by', 'velocity_z', '--json');
  expect(r.code, r.err).toBe(0);
  const j = JSON.parse(r.out);
  const d = await readDataset('pipe-medium.vtu', new Uint8Array(readFileSync(FILE)));
  for (const [i, v] of [0.2, 0.3].entries()) {
    const s = j.surfaces[i];
    const z = e.L - v / e.G;
    expect(s.area / integratePlane(d, { origin: [0, 0, z], normal: [0, 0, 1] }).integrals.area!).toBeCloseTo(1, 12);
    expect(s.area / (3.105828541e-5 / e.L)).toBeCloseTo(1, 9);
    expect(s.closed).toBe(false);
    expect(s.volume).toBeNull();
    expect(s.openReason).toMatch(/^open: \d+ boundary edges$/);
    expect(s.pieces).toHaveLength(1);
    expect(s.colour.field).toBe('velocity_z');
    expect(s.colour.max).toBeCloseTo(2 * e.V, 12);
    expect(s.colour.min).toBeCloseTo(0, 12);
  }
  expect(j.caution).toMatch(/only as good as the simulation/);
  expect(j.units).toMatch(/length unit squared/);
});

it('a ball: closed, volume reported; --out writes .vtp files read back with the same surface', async () => {
  const p = boxMesh('hex', 12, 12, 12, 0.2);
  const file = join(dir, 'ball.vtu');
  writeFileSync(file, writeVtu(datasetOf([withFields(p, [pointFieldFrom(p, 'r', 1, (x, y, z, o) => { o[0] = Math.hypot(x - 0.5, y - 0.5, z - 0.5); })])])));
  const out = join(dir, 'ball.vtp');
  const r = await run('iso-surface', file, '--field', 'r', '--values', '0.25,0.35', '--out', out, '--json');
  expect(r.code, r.err).toBe(0);
  const j = JSON.parse(r.out);
  expect(j.written).toEqual([join(dir, 'ball-1.vtp'), join(dir, 'ball-2.vtp')]);
  for (const [i, R] of [0.25, 0.35].entries()) {
    const s = j.surfaces[i];
    expect(s.closed).toBe(true);
    expect(s.enclosed).toBe('below');
    expect(Math.abs(s.volume / ((4 / 3) * Math.PI * R ** 3) - 1)).toBeLessThan(0.08);
    const back = await readDataset(`ball-${i + 1}.vtp`, new Uint8Array(readFileSync(j.written[i])));
    const piece = back.pieces[0]!;
    expect(piece.cellTypes.length).toBe(s.triangles);
    const idx = Uint32Array.from(piece.connectivity);
    const area = triangleAreas(piece.points, idx).reduce((a, b) => a + b, 0);
    expect(area).toBeCloseTo(s.area, 14);
  }
  const text = await run('iso-surface', file, '--field', 'r', '--values', '0.25');
  expect(text.out).toMatch(/volume 0\.06\d+ {3}\(closed: encloses the region where r < 0\.25\)/);
  expect(text.out.trim().split('\n').pop()).toMatch(/^Caution:/);
});

it('one-line errors name the field, the value or the option', async () => {
  const bad = async (...a: string[]) => { const r = await run('iso-surface', FILE, ...a); expect(r.code).toBe(1); return r.err.trim(); };
  expect(await bad('--field', 'temperature', '--values', '1')).toBe('fieldtally iso-surface: iso field "temperature": no such field in pipe-medium.vtu; expected one of velocity, p (a vector by magnitude, or NAME_x/_y/_z for a component)');
  expect(await bad('--field', 'p', '--values', '1,abc')).toMatch(/--values: expected a number .*"abc"/);
  expect(await bad('--values', '1')).toMatch(/--field is required/);
  expect(await bad('--field', 'p')).toMatch(/--values is required: one or more iso values of "p"/);
  expect(await bad('--field', 'p', '--values', '1', '--out', join(dir, 'x.stl'))).toMatch(/--out .*x\.stl: expected a \.vtp file name/);
  expect(await bad('--field', 'velocity_w', '--values', '1')).toMatch(/iso field "velocity_w": no such field/);
});
