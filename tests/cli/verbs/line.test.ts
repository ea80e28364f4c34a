/**
 * The `line` and `point` verbs end to end on a committed sample file (sample-fields/pipe-coarse.vtu:
 * laminar pipe, exact Hagen–Poiseuille values at the nodes, docs/references.md §1).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../../src/cli/main.ts';
import { CAUTION } from '../../../src/study/caution.ts';

const FILE = resolve(__dirname, '../../../sample-fields/pipe-coarse.vtu');

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

describe('fieldtally line', () => {
  it('CSV: # lines with the file, units and caution, header s,x,y,z,valid, then one column per scalar and name_x,name_y,name_z per vector; empty cells outside', async () => {
    const r = await run('line', FILE, '--from', '-0.012,0.001,0.05', '--to', '0.012,0.001,0.05', '--samples', '25', '--csv');
    expect(r.code).toBe(0);
    const all = r.out.trim().split('\n');
    const comments = all.filter((l) => l.startsWith('#'));
    expect(comments[0]).toBe(`# fieldtally line probe; file: ${FILE}; from (-0.012, 0.001, 0.05) to (0.012, 0.001, 0.05); 25 samples, 19 inside the mesh`);
    // samples every 1 mm at y = 1 mm: inside the R = 10 mm pipe for |x| ≤ 9 mm, i.e. 19 of them
    expect(comments).toContain(`# Caution: ${CAUTION}`);
    expect(all.slice(0, comments.length)).toEqual(comments);
    const lines = all.slice(comments.length);
    expect(lines[0]).toBe('s,x,y,z,valid,velocity_x,velocity_y,velocity_z,p');
    expect(lines.length).toBe(26);
    expect(lines[1]).toMatch(/^0,-0\.012,0\.001,0\.05,0,,,,$/);
    const mid = lines[13]!.split(',').map(Number);
    expect(mid[4]).toBe(1);
    // Centre-line velocity 2V = 0.1 m/s, less 2V(r/R)² at r = 0.001: 0.099 (coarse mesh: within a few %).
    expect(Math.abs(mid[7]! / 0.099 - 1)).toBeLessThan(0.03);
    expect(r.err).toBe('');
  });

  it('JSON: samples, statistics per field, units note, caution; --wall-normal adds the boundary-layer block', async () => {
    const r = await run('line', FILE, '--from', '0.01,0,0.05', '--to', '0,0,0.05', '--crossings', '--fields', 'velocity', '--json', '--wall-normal', '--stream', '0,0,1');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.units).toMatch(/values in the file's units/);
    expect(j.caution).toMatch(/only as good as the simulation/);
    expect(j.mode).toBe('crossings');
    expect(Object.keys(j.samples)).toEqual(['s', 'x', 'y', 'z', 'valid', 'cell', 'velocity_x', 'velocity_y', 'velocity_z']);
    expect(j.stats.fields.map((f: { label: string }) => f.label)).toEqual(['velocity_x', 'velocity_y', 'velocity_z', '|velocity|']);
    expect(j.boundaryLayer.ok).toBe(true);
    // Parabolic profile seen from the wall: H = 2.5 (C, see tests/locate/blasius.test.ts), coarse mesh.
    expect(j.boundaryLayer.shapeFactor).toBeCloseTo(2.5, 1);
  });

  it('a line wholly outside: exit 0, empty samples, flagged, null statistics', async () => {
    const r = await run('line', FILE, '--from', '1,1,1', '--to', '2,1,1', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.outside).toBe(true);
    expect(j.count).toBe(0);
    expect(j.message).toMatch(/wholly outside/);
    expect(j.stats.fields[0].mean).toBeNull();
    const t = await run('line', FILE, '--from', '1,1,1', '--to', '2,1,1');
    expect(t.out).toMatch(/wholly outside the mesh/);
  });

  it('misuse gives a one-line error and exit 1', async () => {
    const r = await run('line', FILE, '--from', '0,0,0');
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/--from and --to are required/);
    const b = await run('line', FILE, '--from', '0,0,0', '--to', '0,0,0.1', '--fields', 'nope');
    expect(b.err).toMatch(/no field "nope"/);
  });
});

describe('fieldtally point', () => {
  const dir = mkdtempSync(join(tmpdir(), 'fieldtally-point-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('--at: text report with values and the caution', async () => {
    const r = await run('point', FILE, '--at', '0,0,0.05');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/1 point\(s\), 1 inside the mesh/);
    expect(r.out).toMatch(/velocity\s+\(/);
    expect(r.out).toMatch(/Caution:/);
  });

  it('--points CSV with labels: JSON with null values and valid false outside', async () => {
    const csv = join(dir, 'taps.csv');
    writeFileSync(csv, 'label,x,y,z\naxis,0,0,0.05\noutside,0.02,0,0.05\n');
    const r = await run('point', FILE, '--points', csv, '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.points.map((p: { label: string }) => p.label)).toEqual(['axis', 'outside']);
    expect(j.points[1].valid).toBe(false);
    expect(j.points[1].values.p).toBeNull();
    expect(j.points[0].values.velocity_z).toBeCloseTo(0.1, 3);
    const c = await run('point', FILE, '--points', csv, '--csv');
    const rows = c.out.trim().split('\n');
    expect(rows.slice(0, 3)).toEqual([
      `# fieldtally point probe; file: ${FILE}; 2 point(s), 1 inside the mesh`,
      "# Units: values in the file's units; positions in the file's length unit; points outside the mesh have valid = 0 and empty values",
      `# Caution: ${CAUTION}`,
    ]);
    expect(rows[3]).toBe('label,x,y,z,valid,velocity_x,velocity_y,velocity_z,p');
    // the axis node: centre-line velocity 2V = 0.1 m/s (Hagen–Poiseuille, exact at the nodes)
    const axis = rows[4]!.split(',');
    expect(axis[0]).toBe('axis');
    expect(Number(axis[7])).toBeCloseTo(0.1, 3);
    expect(rows[5]).toMatch(/^outside,0\.02,0,0\.05,0,,,,$/);
    expect(c.err).toBe('');
  });

  it('a bad sensor file names the line', async () => {
    const csv = join(dir, 'bad.csv');
    writeFileSync(csv, '0,0,0.05\n0,0\n');
    const r = await run('point', FILE, '--points', csv);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/bad\.csv line 2: expected 3 fields as in the first line, found 2/);
  });
});
