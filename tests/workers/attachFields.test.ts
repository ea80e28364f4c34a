/**
 * The app's field calls through the worker contract: `attachFields` makes derived fields and formulas
 * afresh from the file's arrays (so cp follows a new reference speed and a dropped formula is gone), and
 * `wallSurface` colours a surface group by a wall quantity with the other faces marked as having no value.
 * Checks: Hagen–Poiseuille flow (Hagen 1839, Poiseuille 1840; White, Fluid Mechanics, 7th ed., §6.9):
 * u_z = 2V(1 − r²/R²), p = G(L − z), |ω| = 4Vr/R² (4V/R at the wall), τ_w = 4μV/R; Stokes flow past a
 * sphere (Stokes 1851; Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed., §2.6): |τ_w| = (3μU/2a) sin θ.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import * as Comlink from 'comlink';
// @ts-expect-error the adapter ships its types beside the .min.mjs only; typed below
import nodeEndpointUntyped from 'comlink/dist/esm/node-adapter.mjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pipeExact } from '../../src/samples/pipe.ts';
import { sphereExact } from '../../src/samples/sphere.ts';
import { NO_VALUE } from '../../src/surface/wallDrawing.ts';
import type { ComputeApi, WallRequest } from '../../workers/api.ts';

const nodeEndpoint = nodeEndpointUntyped as (w: Worker) => Comlink.Endpoint;
const PIPE = join(__dirname, '../../sample-fields/pipe-medium.vtu');
const SPHERE = join(__dirname, '../../sample-fields/sphere-stokes-celldata.vtu');
let worker: Worker;
let api: Comlink.Remote<ComputeApi>;

const load = (path: string, name: string) => api.load({ kind: 'files', main: { path: name, data: new Uint8Array(readFileSync(path)) }, others: [] });
const water = { density: 998.207, viscosity: 0.0010016 };

beforeAll(() => {
  worker = new Worker(new URL('./nodeWorker.mjs', import.meta.url));
  api = Comlink.wrap<ComputeApi>(nodeEndpoint(worker));
});
afterAll(async () => { api[Comlink.releaseProxy](); await worker.terminate(); });

describe('attachFields', () => {
  const e = pipeExact();

  it('attaches derived fields and formulas, remakes cp on a new reference speed, and drops what is no longer asked for', async () => {
    await load(PIPE, 'pipe-medium.vtu');
    const r1 = await api.attachFields({
      derived: ['vorticity-magnitude', 'cp'], reference: { ...water, speed: 1, pressure: 0 },
      formulas: [{ name: 'dynp', expression: '0.5 * ref.density * dot(velocity, velocity)', unit: 'Pa' }, { name: 'twice', expression: 'dynp * 2' }],
    });
    expect(r1.failed).toEqual([]);
    const range = (name: string, d = r1.description) => d.report.pointData.find((a) => a.name === name)!.range!;
    // the quadratic fit reproduces the quadratic profile: |ω| = 4V/R on the wall nodes
    expect(range('vorticity-magnitude')[1] / (4 * e.V / e.R)).toBeCloseTo(1, 9);
    // cp = p/(½ρU²): largest at the inlet, p = G·L (exact at the nodes)
    expect(range('cp')[1]).toBeCloseTo(e.G * e.L / (0.5 * water.density), 12);
    // ½ρ|u|² on the axis, u = 2V; a formula may use the one before it; the declared unit is the expression's
    expect(range('dynp')[1]).toBeCloseTo(0.5 * water.density * 4 * e.V * e.V, 9);
    expect(range('twice')[1]).toBeCloseTo(water.density * 4 * e.V * e.V, 9);
    expect(r1.formulaUnits).toEqual({ dynp: 'Pa', twice: 'Pa' });
    // the surface is coloured by a formula like by a file array
    const v = await api.surfaceValues({ name: 'dynp', association: 'point', component: -1 });
    expect(v.range[1]).toBeCloseTo(0.5 * water.density * 4 * e.V * e.V, 9);
    // a new reference speed: cp is made again from the file's p (not from the cp attached before)
    const r2 = await api.attachFields({ derived: ['cp'], reference: { ...water, speed: 2 }, formulas: [] });
    expect(range('cp', r2.description)[1]).toBeCloseTo(e.G * e.L / (0.5 * water.density * 4), 12);
    expect(r2.description.report.pointData.map((a) => a.name)).toEqual(['velocity', 'p', 'cp']);
    // probe sets evaluate on the file's own arrays: a set's formula of an attached name is no clash
    const ev = await api.evaluateProbeSet({
      format: 'fieldtally-probe-set', version: 2, formulas: [{ name: 'cp', expression: 'p * 2' }],
      probes: [{ id: 'pt', kind: 'point', geometry: { at: [0, 0, 0.05] }, fields: { sample: ['cp'] } }],
    });
    expect(ev.failed).toBe(0);
    expect(ev.probes[0]!.quantities.find((q) => q.key.startsWith('cp'))!.value).toBeCloseTo(2 * e.G * (e.L - 0.05), 9);
  });

  it('leaves out what cannot be made, with the core\'s one-line message; the rest still works', async () => {
    const r = await api.attachFields({
      derived: ['cp', 'vorticity'], reference: { density: 1000 },
      formulas: [
        { name: 'bad', expression: 'temperature * 2' },
        { name: 'speed', expression: 'mag(velocity)', unit: 'Pa' },
        { name: 'ok', expression: 'mag(velocity)', unit: 'm/s' },
      ],
    });
    expect(r.failed.map((f) => f.name)).toEqual(['cp', 'bad', 'speed']);
    expect(r.failed[0]!.message).toMatch(/cp" needs a positive reference density and speed/);
    expect(r.failed[1]!.message).toMatch(/^formula "bad": .*temperature/);
    expect(r.failed[2]!.message).toBe('formula "speed": the expression gives m/s, but the declared unit is Pa');
    expect(r.description.report.pointData.map((a) => a.name)).toEqual(['velocity', 'p', 'vorticity', 'ok']);
    expect(r.formulaUnits['ok']).toBe('m/s');
    await expect(api.attachFields({ derived: [3 as unknown as string], formulas: [], reference: {} })).rejects.toThrow(/"derived" must be a list/);
    await expect(api.attachFields({ derived: [], formulas: [], reference: { speed: Number.NaN } })).rejects.toThrow(/reference speed must be a finite number/);
  });
});

describe('wallSurface', () => {
  const base: WallRequest = { groups: [1], quantity: 'shear', density: 998.207, speed: 1, viscosity: 0.0010016, thresholds: [1, 5], bins: 10, wallDistance: 'cell-centroid', shearFrom: 'auto' };

  it('pipe wall: τ_w from the second-order velocity gradient, within 1 % of 4μV/R; other groups have no value', async () => {
    await load(PIPE, 'pipe-medium.vtu');
    const e = pipeExact(), r = await api.wallSurface(base);
    expect(r.shearSource).toBe('the second-order velocity gradient of "velocity" with μ = 0.0010016 Pa·s');
    expect(Math.abs(r.stats.shear.mean / (4 * e.mu * e.V / e.R) - 1)).toBeLessThan(0.01);
    // 576 wall quads drawn as 2 triangles each carry values; the 2 × 180 end faces (quads) carry NO_VALUE
    const v = r.values.values;
    let marked = 0;
    for (const x of v) if (x === Math.fround(NO_VALUE)) marked++;
    expect(marked).toBe(2 * 180 * 6);
    expect(v.length - marked).toBe(576 * 6);
    expect(r.values.range[0]).toBeCloseTo(r.stats.shear.min, 6);
    expect(r.values.range[1]).toBeCloseTo(r.stats.shear.max, 6);
    // y+ and the area shares: the thresholds asked
    const y = await api.wallSurface({ ...base, quantity: 'yplus', thresholds: [1.8] });
    expect(y.values.range[1]).toBeCloseTo(y.stats.yPlus!.max, 5);
    expect(y.yPlusAbove.map((t) => t.threshold)).toEqual([1.8]);
    expect(y.yPlusHistogram!.areaShare.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
  });

  it('Stokes sphere: the file\'s wall-shear array is used and said so; |τ_w| at most 3μU/2a', async () => {
    await load(SPHERE, 'sphere-stokes-celldata.vtu');
    const s = sphereExact();
    const r = await api.wallSurface({ ...base, groups: [0], density: s.rho, speed: s.U, viscosity: s.mu });
    expect(r.shearSource).toBe('the file\'s wall-shear array "skinFriction"');
    // cell values at face centroids: slightly inside the equator, so the largest is just below the exact maximum
    expect(r.stats.shear.max / s.wallShearMax).toBeLessThanOrEqual(1 + 1e-9);
    expect(r.stats.shear.max / s.wallShearMax).toBeGreaterThan(0.98);
    // area mean of (3μU/2a) sin θ over the sphere: (3μU/2a)·π/4
    expect(r.stats.shear.mean / (s.wallShearMax * Math.PI / 4)).toBeCloseTo(1, 2);
  });

  it('refuses bad requests with one line naming the member', async () => {
    await expect(api.wallSurface({ ...base, groups: [7] })).rejects.toThrow(/"groups" must list surface group indices 0 … 1, got \[7\]/);
    await expect(api.wallSurface({ ...base, viscosity: 0 })).rejects.toThrow(/viscosity must be a positive number, got 0/);
    await expect(api.wallSurface({ ...base, thresholds: [-1] })).rejects.toThrow(/y\+ thresholds must be up to 20 numbers ≥ 0/);
    await expect(api.wallSurface({ ...base, bins: 0 })).rejects.toThrow(/histogram bins must be a whole number 1 … 200, got 0/);
    await expect(api.wallSurface({ ...base, quantity: 'heat' as 'cf' })).rejects.toThrow(/quantity must be shear, cf or yplus/);
  });
});
