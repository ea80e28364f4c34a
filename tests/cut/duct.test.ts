/**
 * Fully developed laminar flow in a square duct (sample field `ductCase`): the Darcy friction factor from
 * the computed flow rate and the imposed pressure gradient.
 * Reference: docs/references.md §2, rectangular duct (C): Darcy f·Re = 56.908 for α* = 1, with
 * f = 2G·D_h/(ρV²), Re = ρV·D_h/μ, so f·Re = 2G·D_h²/(μV) and V = Q/A from the cut.
 */
import { describe, expect, it } from 'vitest';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { ductCase, ductExact } from '../../src/samples/duct.ts';

function fRe(n: number): number {
  const o = { nx: n, ny: n, nz: 4 }, e = ductExact(o);
  const r = integratePlane(ductCase(o), { origin: [0, 0, 0.0371], normal: [0, 0, 1], integral: { density: e.rho } }).integrals;
  const V = r.volumeFlowRate! / r.area!;
  // The walls are flat: the cut area is the exact 4ab, so D_h = 4A/P is exact too.
  expect(Math.abs(r.area! / e.area - 1)).toBeLessThan(1e-12);
  return (2 * e.G * e.Dh * e.Dh) / (e.mu * V);
}

describe('square duct (docs/references.md §2)', () => {
  it('Darcy f·Re → 56.908 at second order in the mesh spacing', () => {
    const f = [10, 20, 40].map(fRe);
    const err = f.map((v) => v / 56.908 - 1);
    expect(Math.abs(err[2]!)).toBeLessThan(0.002);
    expect(Math.abs(err[1]!)).toBeLessThan(0.01);
    for (let i = 0; i < 2; i++) {
      const p = Math.log(err[i]! / err[i + 1]!) / Math.log(2);
      expect(p).toBeGreaterThan(1.8);
      expect(p).toBeLessThan(2.2);
    }
  });
});
