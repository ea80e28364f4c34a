/**
 * Wall quantities against exact flows:
 *  - Hagen–Poiseuille pipe (REFERENCES §1; Hagen 1839, Poiseuille 1840): τ_w = 4μV/R; with U = V,
 *    c_f = τ_w/(½ρV²) = 16/Re_D (the Fanning friction factor of laminar pipe flow); y⁺ = y·u_τ/ν,
 *    u_τ = √(τ_w/ρ) (common practice). On the n_θ-sided faceted wall the exact nodal gradient gives a
 *    tangential stress τ_w·cos(π/n_θ) on every face, and the first off-wall node of a ring cell lies
 *    (R − r₁)·cos(π/n_θ) from the face plane (r₁ the radius of the next node ring).
 *  - Blasius flat plate (Blasius 1908; Schlichting, Boundary-Layer Theory): c_f = 0.664/√Re_x, here as
 *    2f''(0)/√Re_x with f''(0) = 0.332057 from our own shooting solution (REFERENCES §7) — the velocity of
 *    the similarity solution written on a stretched hexahedral mesh.
 */
import { describe, expect, it } from 'vitest';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { PIPE_LEVELS, pipeCase, pipeExact } from '../../src/samples/pipe.ts';
import { sphereCase, sphereExact } from '../../src/samples/sphere.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../../src/surface/surfaceCache.ts';
import { facesOfGroups } from '../../src/surface/surfaceGroups.ts';
import { wallQuantities } from '../../src/surface/wallQuantities.ts';
import { fPrime, fValue, solveBlasius } from '../locate/blasius.ts';

describe('Hagen–Poiseuille pipe wall', () => {
  const e = pipeExact(), d = pipeCase(PIPE_LEVELS.medium), nTheta = PIPE_LEVELS.medium.nTheta, facet = Math.cos(Math.PI / nTheta);
  const faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
  const wall = groups.groups.reduce((b, g, i, all) => (g.area > all[b]!.area ? i : b), 0);
  const sel = facesOfGroups(groups, [wall]);

  it('τ_w = 4μV/R·cos(π/n_θ) on every face, c_f = 16/Re_D·cos(π/n_θ), from the second-order gradient', () => {
    const r = wallQuantities(d, faces, sel, { density: e.rho, viscosity: e.mu, speed: e.V, source: 'gradient' });
    expect(r.shearSource).toMatchObject({ method: 'velocity-gradient', gradient: 'second-order' });
    for (const t of r.perFace.shearMagnitude) expect(t / (e.wallShearStress * facet)).toBeCloseTo(1, 9);
    expect(r.stats.cf!.mean / ((16 / e.Re) * facet)).toBeCloseTo(1, 9);
    // the shear points along the flow (+z): the fluid drags the wall downstream
    for (let k = 0; k < r.faces; k++) expect(r.perFace.shear[3 * k + 2]! / r.perFace.shearMagnitude[k]!).toBeCloseTo(1, 9);
  });

  it('y+ at the first off-wall node: (R − r₁)cos(π/n_θ)·u_τ/ν on every face (wedge-core pipe, rings at r = kR/n_r); shares and histogram add up', () => {
    const o = { ...PIPE_LEVELS.medium, core: 'wedge' as const }, dw = pipeCase(o);
    const fw = getBoundaryFaces(dw), gw = getSurfaceGroups(dw);
    const w = gw.groups.reduce((b, g, i, all) => (g.area > all[b]!.area ? i : b), 0);
    const r1 = (e.R * (o.nRadial - 1)) / o.nRadial;
    const r = wallQuantities(dw, fw, facesOfGroups(gw, [w]), { density: e.rho, viscosity: e.mu, wallDistance: 'first-node', thresholds: [1, 2, 100], bins: 4 });
    const tau = e.wallShearStress * facet, want = ((e.R - r1) * facet * Math.sqrt(tau / e.rho) * e.rho) / e.mu;
    for (const y of r.perFace.yPlus!) expect(y / want).toBeCloseTo(1, 8);
    expect(r.yPlusAbove.map((t) => t.areaShare)).toEqual([want > 1 ? 1 : 0, want > 2 ? 1 : 0, 0]);
    expect(r.yPlusHistogram!.areaShare.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    expect(r.notes.some((n) => n.startsWith('c_f not computed'))).toBe(true);
  });

  it('the cell-centroid distance lies between the wall and the first node (cells of the ring), and y+ follows it', () => {
    const a = wallQuantities(d, faces, sel, { density: e.rho, viscosity: e.mu });
    const b = wallQuantities(d, faces, sel, { density: e.rho, viscosity: e.mu, wallDistance: 'first-node' });
    for (let k = 0; k < a.faces; k++) {
      expect(a.perFace.wallDistance[k]!).toBeGreaterThan(0.4 * b.perFace.wallDistance[k]!);
      expect(a.perFace.wallDistance[k]!).toBeLessThan(0.6 * b.perFace.wallDistance[k]!);
    }
    expect(a.wallDistanceDefinition).toMatch(/centroid/);
  });

  it('the file\'s wall-shear array is used when present and said so (Stokes sphere, max 3μU/2a at the equator; Stokes 1851); without μ and no array: a clear error', () => {
    const s = sphereCase({ refinement: 1 }), ex = sphereExact(), fs = getBoundaryFaces(s), gs = getSurfaceGroups(s);
    const r = wallQuantities(s, fs, facesOfGroups(gs, [gs.groups.findIndex((g) => g.id === 1)]), { density: ex.rho, viscosity: ex.mu });
    expect(r.shearSource).toMatchObject({ method: 'wall-shear-array', array: 'skinFriction' });
    expect(r.stats.shearMagnitude.max / ex.wallShearMax).toBeGreaterThan(0.98);
    expect(r.stats.shearMagnitude.max / ex.wallShearMax).toBeLessThanOrEqual(1 + 1e-12);
    const faces2 = getBoundaryFaces(d);
    expect(() => wallQuantities(d, faces2, sel, { density: e.rho })).toThrow(/wall quantities: viscous force not computed: no wall-shear array and no viscosity μ given/);
  });
});

describe('Blasius flat plate: c_f = 0.664/√Re_x (Blasius 1908)', () => {
  it('local c_f within 1 % of 2f″(0)/√Re_x between x = 0.3 and 0.9 m', () => {
    const sol = solveBlasius(), U = 1, nu = 1e-5, rho = 1, x0 = 0.2, x1 = 1.0, H = 0.04;
    // wall-clustered y: y = H·(e^{3s} − 1)/(e³ − 1)
    const p = hexGrid(40, 48, 1, (s, t, w) => [x0 + (x1 - x0) * s, (H * (Math.exp(3 * t) - 1)) / (Math.exp(3) - 1), 0.01 * w]);
    const vel = pointFieldFrom(p, 'velocity', 3, (x, y, _z, out) => {
      const eta = y * Math.sqrt(U / (nu * x));
      out[0] = U * fPrime(sol, eta); out[1] = 0.5 * Math.sqrt((nu * U) / x) * (eta * fPrime(sol, eta) - fValue(sol, eta)); out[2] = 0;
    });
    const pres = pointFieldFrom(p, 'p', 1, () => 0);
    const d = datasetOf([withFields(p, [vel, pres])], 'blasius plate');
    const faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
    const plate = groups.groups.findIndex((g) => Math.abs(g.centroid[1]) < 1e-12 && g.bounds[3] < 1e-12);
    const r = wallQuantities(d, faces, facesOfGroups(groups, [plate]), { density: rho, viscosity: rho * nu, speed: U });
    let checked = 0;
    for (let k = 0; k < r.faces; k++) {
      const f = facesOfGroups(groups, [plate])[k]!, x = faces.centroid[3 * f]!;
      if (x < 0.3 || x > 0.9) continue;
      const want = (2 * sol.fpp0) / Math.sqrt((U * x) / nu);
      expect(Math.abs(r.perFace.cf![k]! / want - 1), `x = ${x}`).toBeLessThan(0.01);
      checked++;
    }
    expect(checked).toBeGreaterThan(20);
    expect(sol.fpp0).toBeCloseTo(0.332057, 5);
  });
});
