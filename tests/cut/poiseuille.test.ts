/**
 * Hagen–Poiseuille pipe flow (sample field `pipeCase`): flow rate and total-pressure means against the
 * exact solution, with the error falling at second order over three meshes.
 * Reference: docs/references.md §1, Hagen–Poiseuille (C): Q = πR²V; with uniform p over the section,
 * mass-flow-weighted p₀ = p + ρV² and area-weighted p₀ = p + (2/3)ρV².
 */
import { describe, expect, it } from 'vitest';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { PIPE_LEVELS, pipeCase, pipeExact } from '../../src/samples/pipe.ts';

const LEVELS = ['coarse', 'medium', 'fine'] as const;
const Z = 0.0437; // between node layers on every level

function errors(core: 'hex' | 'wedge') {
  return LEVELS.map((lv) => {
    const o = { ...PIPE_LEVELS[lv], core }, e = pipeExact(o);
    const r = integratePlane(pipeCase(o), { origin: [0, 0, Z], normal: [0, 0, 1], integral: { density: e.rho } }).integrals;
    const p = e.G * (e.L - Z), q = e.rho * e.V * e.V;
    return {
      Q: (r.volumeFlowRate! - e.Q) / e.Q,
      mdot: (r.massFlowRate! - e.massFlow) / e.massFlow,
      p0mass: (r.totalPressure!.massFlowMean! - (p + q)) / q,
      p0area: (r.totalPressure!.areaMean! - (p + (2 / 3) * q)) / q,
      // p is uniform over the section (linear in z), so its means are exact on any mesh.
      p: (r.staticPressure!.areaMean - p) / p,
    };
  });
}

/** Observed order between successive levels (refinement ratio 1.5 per level). */
const order = (a: number, b: number) => Math.log(Math.abs(a / b)) / Math.log(1.5);

describe('Hagen–Poiseuille pipe (docs/references.md §1)', () => {
  for (const core of ['hex', 'wedge'] as const) {
    it(`${core} core: Q → πR²V, mass-flow p₀ → p + ρV², area p₀ → p + (2/3)ρV², at second order`, () => {
      const e = errors(core);
      for (const key of ['Q', 'mdot', 'p0mass', 'p0area'] as const) {
        const o1 = order(e[0]![key], e[1]![key]), o2 = order(e[1]![key], e[2]![key]);
        expect(o1, `${key} order coarse→medium`).toBeGreaterThan(1.7);
        expect(o1, `${key} order coarse→medium`).toBeLessThan(2.3);
        expect(o2, `${key} order medium→fine`).toBeGreaterThan(1.7);
        expect(o2, `${key} order medium→fine`).toBeLessThan(2.3);
        expect(Math.abs(e[2]![key]), `${key} fine error`).toBeLessThan(0.01);
      }
      for (const lv of e) expect(Math.abs(lv.p)).toBeLessThan(1e-12);
    });
  }

  it('a pipe split into pieces (interface points duplicated) gives the same numbers, also on a piece interface', () => {
    const e = pipeExact();
    for (const z of [0.05, 0.0437]) {
      const one = integratePlane(pipeCase({ nAxial: 24 }), { origin: [0, 0, z], normal: [0, 0, 1], integral: { density: e.rho } }).integrals;
      const three = integratePlane(pipeCase({ nAxial: 24, pieces: 4 }), { origin: [0, 0, z], normal: [0, 0, 1], integral: { density: e.rho } }).integrals;
      expect(Math.abs(three.volumeFlowRate! / one.volumeFlowRate! - 1)).toBeLessThan(1e-12);
      expect(Math.abs(three.area! / one.area! - 1)).toBeLessThan(1e-12);
    }
  });

  it('cell-data fields (values at cell centroids) converge to the same flow rate', () => {
    const e = pipeExact(PIPE_LEVELS.fine);
    const r = integratePlane(pipeCase({ ...PIPE_LEVELS.fine, association: 'cell' }), { origin: [0, 0, Z], normal: [0, 0, 1], integral: { density: e.rho } }).integrals;
    expect(r.roles.velocity).toBe('velocity (cell)');
    expect(Math.abs(r.volumeFlowRate! / e.Q - 1)).toBeLessThan(0.01);
  });
});
