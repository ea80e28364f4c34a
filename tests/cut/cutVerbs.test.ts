/**
 * The command-line verbs `cut`, `loss` and `balance` on a pipe file written to a temporary folder.
 * Reference: docs/references.md §1, Hagen–Poiseuille (C) — Δp₀ between two sections = G·ΔL; the JSON
 * numbers must equal the library's (same code path) and carry units, sign convention and caution.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { pipeCase, pipeExact } from '../../src/samples/pipe.ts';

let dir = '', file = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-cutverbs-'));
  file = join(dir, 'pipe.vtu');
  writeFileSync(file, writeVtu(pipeCase()));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

describe('fieldtally cut', () => {
  it('--json has the required keys, with the library\'s numbers', async () => {
    const e = pipeExact();
    const r = await run('cut', file, '--origin', '0,0,0.05', '--normal', '0,0,2', '--rho', String(e.rho), '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    for (const k of ['area', 'centroid', 'normal', 'volumeFlowRate', 'massFlowRate', 'areaMean', 'massFlowMean', 'totalPressure', 'units', 'signConvention', 'caution']) expect(j).toHaveProperty(k);
    const lib = integratePlane(pipeCase(), { origin: [0, 0, 0.05], normal: [0, 0, 1], integral: { density: e.rho } }).integrals;
    expect(j.volumeFlowRate).toBeCloseTo(lib.volumeFlowRate!, 15);
    expect(j.massFlowRate).toBeCloseTo(lib.massFlowRate!, 12);
    expect(j.normal).toEqual([0, 0, 1]);
    expect(j.areaMean.velocity).toHaveLength(3);
    expect(j.totalPressure.massFlowMean).toBeCloseTo(lib.totalPressure!.massFlowMean!, 9);
    expect(j.units).toMatch(/file's units/);
    expect(j.caution).toMatch(/licensed professional/);
    expect(Math.abs(j.volumeFlowRate / e.Q - 1)).toBeLessThan(0.02);
  });

  it('prints a readable table with the caution; errors are one line with exit code 1', async () => {
    const t = await run('cut', file, '--origin', '0,0,0.05', '--normal', '0,0,1', '--rho', '998.207');
    expect(t.code).toBe(0);
    expect(t.out).toMatch(/volume-flow rate Q\s+1\.5\d+e-5/);
    expect(t.out).toMatch(/Caution: /);
    const miss = await run('cut', file, '--origin', '0,0,1', '--normal', '0,0,1');
    expect(miss.code).toBe(0);
    expect(miss.out).toMatch(/EMPTY: the plane misses every 3D cell/);
    const seed = await run('cut', file, '--origin', '0,0,0.05', '--normal', '0,0,1', '--seed', '0.05,0,0.05');
    expect(seed.code).toBe(1);
    expect(seed.err).toMatch(/off the cut/);
    const noVel = await run('cut', file, '--origin', '0,0,0.05', '--normal', '0,0,1', '--velocity', 'none', '--json');
    expect(noVel.code).toBe(0);
    expect(JSON.parse(noVel.out).volumeFlowRate).toBeNull();
    const unknown = await run('cut', file, '--origin', '0,0,0.05', '--normal', '0,0,1', '--velocity', 'U');
    expect(unknown.err).toMatch(/velocity: no field "U"/);
    const plain = join(dir, 'plain.vtu');
    const cube = hexGrid(2, 2, 2);
    writeFileSync(plain, writeVtu(datasetOf([withFields(cube, [pointFieldFrom(cube, 'T', 1, (x, _y, _z, o) => { o[0] = x; })])])));
    const needVel = await run('cut', plain, '--origin', '0,0,0.5', '--normal', '0,0,1');
    expect(needVel.code).toBe(1);
    expect(needVel.err).toMatch(/no field named like a velocity: give --velocity <name> \(3-component fields: none\) or --velocity none/);
    const bad = await run('cut', file, '--origin', '0,0,0.05');
    expect(bad.code).toBe(1);
    expect(bad.err).toMatch(/--origin and --normal are required/);
  });

  it('region options: a disk of radius R/2 holds (1 − (1 − ¼)²) = 7/16 of the Poiseuille flow', async () => {
    // Reference: ∫₀^{R/2} 2V(1 − r²/R²) 2πr dr / (πR²V) = 7/16 (docs/references.md §1 profile, C); mesh error O(h²).
    const e = pipeExact();
    const j = JSON.parse((await run('cut', file, '--origin', '0,0,0.05', '--normal', '0,0,1', '--disk', `0,0,0.05:${e.R / 2}`, '--json')).out);
    expect(j.area).toBeCloseTo(Math.PI * e.R * e.R / 4, 15);
    expect(Math.abs(j.volumeFlowRate / (e.Q * 7 / 16) - 1)).toBeLessThan(0.02);
  });
});

describe('fieldtally loss and balance', () => {
  it('loss: Δp₀ = G·ΔL and K from the upstream mean velocity', async () => {
    const e = pipeExact();
    const j = JSON.parse((await run('loss', file, '--upstream', '0,0,0.02@0,0,1', '--downstream', '0,0,0.08@0,0,1', '--rho', String(e.rho), '--json')).out);
    expect(Math.abs(j.totalPressureLoss / (e.G * 0.06) - 1)).toBeLessThan(1e-9);
    expect(j.lossCoefficient).toBeCloseTo(j.totalPressureLoss / j.dynamicPressure, 9);
    expect(j.reference).toBe('upstream');
  });

  it('balance: two planes with outward normals balance to rounding; boundary groups join by id', async () => {
    const r = await run('balance', file, '--planes', '0,0,0.02@0,0,-1; 0,0,0.08@0,0,1', '--rho', '998.207', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.basis).toBe('mass');
    expect(Math.abs(j.imbalanceShare)).toBeLessThan(1e-12);
    expect(j.items).toHaveLength(2);
    const t = await run('balance', file, '--planes', '0,0,0.02@0,0,-1', '--surfaces', '2');
    expect(t.code).toBe(0);
    expect(t.out).toMatch(/volume flow balance/);
    expect(t.out).toMatch(/surface 2 "/);
  });
});
