/**
 * Boundary-layer integrals of a wall-normal line probe through a Blasius boundary layer.
 * Reference: docs/references.md §7, Blasius (C, shooting): f''(0) = 0.332057, δ* / x·√Re_x = 1.7208,
 * θ/x·√Re_x = 0.6641, H = 2.591, δ99/x ≈ 4.91/√Re_x. The profile is solved here by shooting
 * (tests/locate/blasius.ts) and put on the nodes of a hexahedral mesh; the probe then has to recover
 * the integrals to about three significant figures.
 * A second reference for the integrals themselves: the laminar pipe profile seen from the wall,
 * u/U_e = 2σ − σ² (σ = distance/R), gives δ* = R/3, θ = 2R/15, H = 2.5, δ99 = 0.9R (C: integrated by hand).
 */
import { describe, expect, it } from 'vitest';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { boundaryLayer } from '../../src/locate/boundaryLayer.ts';
import { probeLine } from '../../src/locate/lineProbe.ts';
import { pipeCase, pipeExact } from '../../src/samples/pipe.ts';
import { fPrime, fValue, solveBlasius } from './blasius.ts';

const sol = solveBlasius();
const U = 1, nu = 1e-5;

/** Flat plate along +x from x = 0, wall y = 0; mesh x in [0.5, 1.5], y in [0, 0.04], one layer in z. */
function blasiusMesh(ny: number) {
  const p = hexGrid(4, ny, 1, (u, v, w) => [0.5 + u, 0.04 * v, 0.01 * w]);
  return datasetOf([withFields(p, [pointFieldFrom(p, 'velocity', 3, (x, y, _z, o) => {
    const s = Math.sqrt(nu * x / U), eta = y / s;
    o[0] = U * fPrime(sol, eta);
    o[1] = 0.5 * U * (s / x) * (eta * fPrime(sol, eta) - fValue(sol, eta));
    o[2] = 0;
  })])], 'blasius plate');
}

describe('boundary-layer quantities', () => {
  it('the shooting solution gives f\'\'(0) = 0.332057 and the integrals (computed, not read: Blasius, docs/references.md §7)', () => {
    expect(sol.fpp0).toBeCloseTo(0.332057, 6);
    // ∫(1 − f') dη = η_max − f(η_max); θ = 2 f''(0) by the momentum integral.
    expect(sol.etaMax - sol.f[sol.f.length - 1]!).toBeCloseTo(1.7208, 4);
    let theta = 0;
    for (let i = 0; i + 1 < sol.fp.length; i++) {
      const a = sol.fp[i]!, b = sol.fp[i + 1]!;
      theta += 0.5 * sol.h * (a * (1 - a) + b * (1 - b));
    }
    expect(theta).toBeCloseTo(0.6641, 4);
  });

  it('Blasius profile on a mesh: δ* / x·√Re = 1.7208, θ/x·√Re = 0.6641, H = 2.591 at every cell crossing', () => {
    const d = blasiusMesh(240);
    const x = 1.0, scale = Math.sqrt(U * x / nu) / x;
    const r = probeLine(d, [x, 0, 0.005], [x, 0.04, 0.005], { mode: 'crossings', fields: ['velocity'] });
    expect(r.count).toBe(241);
    const bl = boundaryLayer(r, { field: 'velocity' });
    expect(bl.ok).toBe(true);
    expect(bl.edgeVelocity).toBeCloseTo(1, 6);
    expect(bl.displacementThickness * scale).toBeCloseTo(1.7208, 3);
    expect(bl.momentumThickness * scale).toBeCloseTo(0.6641, 3);
    expect(bl.shapeFactor).toBeCloseTo(2.591, 2);
    expect(Math.abs(bl.shapeFactor - 2.591) / 2.591).toBeLessThan(1e-3);
    // δ99/x ≈ 4.91/√Re_x (Blasius, docs/references.md §7, "≈").
    expect(bl.delta99 * scale).toBeCloseTo(4.91, 1);
  });

  it('the same from 2001 evenly spaced samples, and with the gradient edge criterion', () => {
    const d = blasiusMesh(240);
    const x = 1.0, scale = Math.sqrt(U * x / nu) / x;
    const r = probeLine(d, [x, 0, 0.005], [x, 0.04, 0.005], { samples: 2001, fields: ['velocity'] });
    const bl = boundaryLayer(r);
    expect(bl.displacementThickness * scale).toBeCloseTo(1.7208, 3);
    expect(bl.momentumThickness * scale).toBeCloseTo(0.6641, 3);
    expect(Math.abs(bl.shapeFactor - 2.591) / 2.591).toBeLessThan(1e-3);
    const g = boundaryLayer(r, { edge: 'gradient' });
    expect(g.ok).toBe(true);
    expect(g.edgeVelocity).toBeGreaterThan(0.999);
    expect(Math.abs(g.displacementThickness * scale - 1.7208) / 1.7208).toBeLessThan(2e-3);
    expect(Math.abs(g.momentumThickness * scale - 0.6641) / 0.6641).toBeLessThan(2e-3);
  });

  it('pipe profile seen from the wall: δ* = R/3, θ = 2R/15, H = 2.5, δ99 = 0.9R', () => {
    const d = pipeCase({ nTheta: 96, nRadial: 48, nAxial: 2 });
    const e = pipeExact({});
    const R = e.R, z = 0.0437;
    // From the wall node at angle 0 to the axis, along the radius; the flow is along +z.
    const r = probeLine(d, [R, 0, z], [0, 0, z], { mode: 'crossings', fields: ['velocity'] });
    const bl = boundaryLayer(r, { direction: [0, 0, 1] });
    expect(bl.ok).toBe(true);
    expect(bl.edgeVelocity).toBeCloseTo(e.uMax, 4);
    expect(Math.abs(bl.displacementThickness / (R / 3) - 1)).toBeLessThan(2e-3);
    expect(Math.abs(bl.momentumThickness / (2 * R / 15) - 1)).toBeLessThan(2e-3);
    expect(Math.abs(bl.shapeFactor / 2.5 - 1)).toBeLessThan(2e-3);
    expect(Math.abs(bl.delta99 / (0.9 * R) - 1)).toBeLessThan(2e-3);
  });

  it('flags a line that does not start in the mesh, and an edge criterion that never triggers', () => {
    const d = blasiusMesh(40);
    const off = probeLine(d, [1, -0.01, 0.005], [1, 0.04, 0.005], { samples: 50 });
    const bl = boundaryLayer(off);
    expect(bl.ok).toBe(false);
    expect(bl.reason).toMatch(/does not start inside the mesh/);
    expect(bl.displacementThickness).toBeNaN();
    const short = probeLine(d, [1, 0, 0.005], [1, 0.002, 0.005], { samples: 50 });
    expect(boundaryLayer(short, { edge: 'gradient' }).reason).toMatch(/never fell below/);
    expect(boundaryLayer(short).warnings.join(' ')).toMatch(/maximum is at the last sample/);
    expect(() => boundaryLayer(short, { field: 'nope' })).toThrow(/field "nope" was not sampled/);
  });
});
