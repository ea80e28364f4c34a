/**
 * `bench --workers N`: the cut, line and boundary stages on the worker pool give the figures of the same stages on
 * one thread (triangles, cells cut, valid samples, boundary faces — counts that do not depend on timing), and the
 * pool's set-up is reported as its own stage. The file: a 20³ hexahedron lattice with a pressure at the points,
 * written as appended raw. Expected counts are those of the one-thread run and of the lattice itself
 * (6 · 20² boundary quadrilaterals; an axis-normal plane through a 20 × 20 lattice cuts 20² cells).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../../src/cli/main.ts';
import { writeVtu } from '../../../src/io/writeVtu.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../../src/model/meshBuild.ts';

let dir = '', file = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-benchworkers-'));
  file = join(dir, 'lattice.vtu');
  const p = hexGrid(20, 20, 20);
  const d = datasetOf([withFields(p, [pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - z) + x * y; })])]);
  writeFileSync(file, writeVtu(d, { encoding: 'appended-raw' }));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

type Figures = {
  poolSetup?: { ms: number; cpuMs: number; workers: number };
  cut: { firstCut: { triangles: number; candidates: number }; laterCuts: { triangles: { median: number }; cellsCut: { median: number } } };
  locate: { firstLine: { valid: number }; laterLines: { validFraction: number } };
  surface: { boundaryFaces: number; force: { faces: number } };
};

describe('bench --workers', () => {
  it('runs the cut, line and boundary stages on 2 workers with the one-thread counts, the set-up apart', async () => {
    const two = await run(['bench', file, '--json', '--stages', 'cut,locate,surface', '--workers', '2']);
    const one = await run(['bench', file, '--json', '--stages', 'cut,locate,surface', '--workers', '1']);
    expect(two.err).toBe('');
    expect([two.code, one.code]).toEqual([0, 0]);
    const a = JSON.parse(two.out) as Figures, b = JSON.parse(one.out) as Figures;
    expect(a.poolSetup?.workers).toBe(2);
    expect(a.poolSetup!.ms).toBeGreaterThan(0);
    expect(b.poolSetup).toBeUndefined();
    // the first plane is x = 0.3137 of the bounds: it crosses one layer of 20 × 20 cells, two triangles each
    expect(a.cut.firstCut.triangles).toBe(800);
    expect(a.cut.firstCut).toMatchObject({ triangles: b.cut.firstCut.triangles, candidates: b.cut.firstCut.candidates });
    expect(a.cut.laterCuts.triangles).toEqual(b.cut.laterCuts.triangles);
    expect(a.cut.laterCuts.cellsCut).toEqual(b.cut.laterCuts.cellsCut);
    expect(a.locate.firstLine.valid).toBe(b.locate.firstLine.valid);
    expect(a.locate.laterLines.validFraction).toBe(b.locate.laterLines.validFraction);
    expect(a.surface.boundaryFaces).toBe(6 * 20 * 20);
    expect(b.surface.boundaryFaces).toBe(6 * 20 * 20);
    expect(a.surface.force.faces).toBe(b.surface.force.faces);
  });

  it('refuses a count that is not a whole number of workers, in one line naming --workers', async () => {
    const r = await run(['bench', file, '--json', '--stages', 'cut', '--workers', 'two']);
    expect(r.code).not.toBe(0);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).toMatch(/--workers/);
  });
});
