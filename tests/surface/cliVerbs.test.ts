/**
 * The `surfaces` and `force` verbs end to end on a Stokes-sphere file written to a temporary folder.
 * Reference: docs/references.md §3 (drag 3πμUD, pressure 1/3, viscous 2/3, C_D = 24/Re).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { sphereCase, sphereExact } from '../../src/samples/sphere.ts';

let dir = '', file = '';
const o = { refinement: 1 };
const e = sphereExact(o);

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-surface-cli-'));
  file = join(dir, 'bead.vtu');
  writeFileSync(file, writeVtu(sphereCase(o)));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

describe('fieldtally surfaces', () => {
  it('lists the groups with area, centroid, bounds and closedness (JSON)', async () => {
    const r = await run('surfaces', file, '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.groups.map((g: { id: number; name: string }) => [g.id, g.name])).toEqual([[1, 'group 1'], [2, 'group 2']]);
    expect(j.groups[0].closed).toBe(true);
    expect(j.groups[0].area / (4 * Math.PI * e.a ** 2)).toBeGreaterThan(0.99);
    expect(j.groups[1].bounds[1]).toBeCloseTo(e.outerRadius, 12);
    expect(j.caution).toMatch(/only as good as the simulation/);
  });

  it('prints a readable list; a feature angle outside 0…180 is refused', async () => {
    const r = await run('surfaces', file, '--feature-angle', '30');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/2 group\(s\) from cell array "group"/);
    expect(r.out).toMatch(/closed/);
    expect((await run('surfaces', file, '--feature-angle', '200')).err).toMatch(/--feature-angle: expected degrees in 0…180/);
  });
});

describe('fieldtally force', () => {
  it('JSON has the forces, moment, coefficients with pressure and viscous parts, sign convention and units', async () => {
    const r = await run('force', file, '--groups', '1', '--rho', String(e.rho), '--speed', String(e.U), '--area', String(e.frontalArea),
      '--length', String(2 * e.a), '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    for (const k of ['pressureForce', 'viscousForce', 'force', 'moment']) expect(j[k]).toHaveLength(3);
    expect(j.force[0] / e.dragTotal).toBeCloseTo(1, 1);
    expect(j.pressureForce[0] / j.force[0]).toBeCloseTo(1 / 3, 2);
    expect(j.viscousForce[0] / j.force[0]).toBeCloseTo(2 / 3, 2);
    expect(j.coefficients.drag / e.CD).toBeCloseTo(1, 1);
    // the sample's wall-shear array, skinFriction, is found by its name
    expect(j.viscous.array).toBe('skinFriction');
    expect(j.coefficients.pressure.drag + j.coefficients.viscous.drag).toBeCloseTo(j.coefficients.drag, 10);
    expect(Math.abs(j.coefficients.lift)).toBeLessThan(1e-9);
    expect(j.coefficients.moment).not.toBeNull();
    expect(j.signConvention).toMatch(/on the wall/);
    expect(j.units).toMatch(/N for Pa and m/);
    expect(j.caution).toMatch(/licensed professional/);
  });

  it('viscous part from the velocity gradient with --mu; by group name; with a drag distribution', async () => {
    const r = await run('force', file, '--groups', 'group 1', '--viscous', 'gradient', '--mu', String(e.mu), '--strips', '4', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.viscous.method).toBe('velocity-gradient');
    expect(j.viscousForce[0] / e.dragViscous).toBeGreaterThan(0.8);
    expect(j.coefficients).toBeNull();
    expect(j.distribution.cumulativeDrag[4] / j.force[0]).toBeCloseTo(1, 12);
  });

  it('spelled-out names: --drag-direction, --lift-direction, --reference-pressure; old names still work with a notice', async () => {
    const base = ['force', file, '--groups', '1', '--json'];
    const now = await run(...base, '--drag-direction', '0,0,1', '--lift-direction', '1,0,0', '--reference-pressure', '250', '--strips', '3');
    expect(now.code).toBe(0);
    expect(now.err).toBe('');
    const j = JSON.parse(now.out);
    // the flow is along +x: with drag along z, the drag component is the force's z part and the lift its x part
    expect(j.directions.drag).toEqual([0, 0, 1]);
    expect(j.components.total.lift).toBeCloseTo(j.force[0], 12);
    expect(j.distribution.edges).toHaveLength(4);
    // A constant reference pressure adds nothing on a closed surface (∮ n dA = 0, Gauss' theorem)
    const plain = JSON.parse((await run(...base)).out);
    for (let k = 0; k < 3; k++) expect(j.pressureForce[k]).toBeCloseTo(plain.pressureForce[k], 9);
    const old = await run(...base, '--drag-dir', '0,0,1', '--lift-dir', '1,0,0', '--p-ref', '250', '--bins', '3');
    expect(old.code).toBe(0);
    expect(JSON.parse(old.out)).toEqual(j);
    expect(old.err.trim().split('\n')).toEqual([
      'fieldtally force: --drag-dir is now --drag-direction; the old name will be removed in the next version',
      'fieldtally force: --lift-dir is now --lift-direction; the old name will be removed in the next version',
      'fieldtally force: --p-ref is now --reference-pressure; the old name will be removed in the next version',
      'fieldtally force: --bins is now --strips; the old name will be removed in the next version',
    ]);
    // hidden: neither the help nor the list of known options names the old spellings
    const help = (await run('force', '--help')).out;
    const unknown = (await run('force', file, '--groups', '1', '--drag')).err;
    for (const text of [help, unknown]) expect(text).not.toMatch(/--drag-dir\b|--lift-dir\b|--p-ref\b|--bins\b/);
    expect(unknown).toMatch(/unknown option --drag \(known: .*--drag-direction/);
  });

  it('prints a text report; refuses incomplete reference values and unknown groups with one-line errors', async () => {
    const t = await run('force', file, '--groups', '1');
    expect(t.code).toBe(0);
    expect(t.out).toMatch(/total force/);
    expect(t.out).toMatch(/Caution:/);
    expect((await run('force', file, '--groups', '1', '--rho', '1')).err).toMatch(/need all of --rho, --speed and --area/);
    const bad = await run('force', file, '--groups', 'wing');
    expect(bad.code).toBe(1);
    expect(bad.err).toMatch(/no surface group "wing"/);
    expect((await run('force', file)).err).toMatch(/--groups is required/);
  });
});
