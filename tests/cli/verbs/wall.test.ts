/**
 * The `wall` verb end to end on sample-fields/pipe-medium.vtu (laminar pipe, Hagen–Poiseuille: τ_w = 4μV/R,
 * REFERENCES §1; on the 24-sided faceted wall the exact nodal gradient gives τ_w·cos(π/24) per face).
 */
import { resolve } from 'node:path';
import { expect, it } from 'vitest';
import { main } from '../../../src/cli/main.ts';
import { pipeExact } from '../../../src/samples/pipe.ts';

const FILE = resolve(__dirname, '../../../sample-fields/pipe-medium.vtu');

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

it('JSON: τ_w, c_f and y+ statistics per group, the source of τ_w, the y definition and the caution', async () => {
  const e = pipeExact();
  const r = await run('wall', FILE, '--groups', '1', '--rho', String(e.rho), '--mu', String(e.mu), '--speed', String(e.V), '--json');
  expect(r.code, r.err).toBe(0);
  const j = JSON.parse(r.out);
  const g = j.groups[0];
  expect(g.shearSource).toMatchObject({ method: 'velocity-gradient', gradient: 'second-order' });
  expect(g.stats.shearMagnitude.mean / (e.wallShearStress * Math.cos(Math.PI / 24))).toBeCloseTo(1, 9);
  expect(g.stats.cf.mean / ((16 / e.Re) * Math.cos(Math.PI / 24))).toBeCloseTo(1, 9);
  expect(g.yPlusAbove.map((t: { threshold: number }) => t.threshold)).toEqual([1, 5, 30]);
  expect(g.wallDistanceDefinition).toMatch(/centroid/);
  expect(j.caution).toMatch(/only as good as the simulation/);
});

it('text output names the source and ends with the caution; bad options get one-line errors', async () => {
  const r = await run('wall', FILE, '--groups', '1', '--rho', '998.207', '--mu', '1.0016e-3');
  expect(r.code).toBe(0);
  expect(r.out).toMatch(/τ_w from the velocity gradient of "velocity" \(second-order\)/);
  expect(r.out).toMatch(/c_f not computed: give the reference density and speed/);
  expect(r.out.trim().split('\n').pop()).toMatch(/^Caution:/);
  const bad = await run('wall', FILE, '--groups', '1', '--wall-distance', 'middle');
  expect(bad.code).toBe(1);
  expect(bad.err.trim()).toBe('fieldtally wall: --wall-distance: expected cell-centroid or first-node, got "middle"');
  const none = await run('wall', FILE, '--groups', '1');
  expect(none.code).toBe(1);
  expect(none.err).toMatch(/no viscosity μ given/);
});

it('groups chosen by what they are (area, box, nearest point, name) take the same wall, τ_w = 4μV/R; a choice matching nothing names the known groups', async () => {
  const e = pipeExact();
  // Hagen–Poiseuille (REFERENCES §1): τ_w = 4μV/R, times cos(π/24) on the 24-faceted wall
  const tauW = 4 * e.mu * e.V / e.R, facet = Math.cos(Math.PI / 24);
  const common = ['--rho', String(e.rho), '--mu', String(e.mu), '--speed', String(e.V), '--json'];
  const box = [-2 * e.R, 2 * e.R, -2 * e.R, 2 * e.R, -0.01, e.L + 0.01].join(',');
  for (const choice of [['--groups-area-from', '1e-3'], ['--groups-within', box, '--groups-area-from', '1e-3'], ['--group-nearest-to', `${e.R},0,${e.L / 2}`], ['--group-named', 'part 1']]) {
    const r = await run('wall', FILE, ...choice, ...common);
    expect(r.code, r.err).toBe(0);
    const groups = JSON.parse(r.out).groups as { id: number; stats: { shearMagnitude: { mean: number } } }[];
    expect(groups.map((g) => g.id), choice.join(' ')).toEqual([1]);
    expect(groups[0]!.stats.shearMagnitude.mean / (tauW * facet)).toBeCloseTo(1, 9);
  }
  const none = await run('wall', FILE, '--group-named', 'outlet', ...common);
  expect(none.code).toBe(1);
  expect(none.err.trim()).toMatch(/^fieldtally wall: no surface group named "outlet" \(known: 0 "part 0" \(area [\d.e-]+\), 1 "part 1" \(area [\d.e-]+\), 2 "part 2" \(area [\d.e-]+\)\)$/);
});
