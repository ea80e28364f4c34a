import { describe, expect, it } from 'vitest';
import { gridConvergence, meshSize2D } from '../../src/study/gci.ts';

describe('grid-convergence estimate', () => {
  it('reproduces the worked example of Celik et al. 2008, Table 1, column 1', () => {
    // Reference: docs/references.md §6 — Celik et al., J. Fluids Eng. 130 (2008) 078001, Table 1 col. 1
    // (V via secondary source: pyGCS tests; C recomputed). N = 18000/8000/4500 cells of a 2D mesh.
    const area = 1; // any fixed area: only ratios of h matter
    const h: [number, number, number] = [meshSize2D(area, 18000), meshSize2D(area, 8000), meshSize2D(area, 4500)];
    const r = gridConvergence({ h, phi: [6.063, 5.972, 5.863] });
    expect(r.kind).toBe('monotonic');
    expect(r.r21).toBeCloseTo(1.5, 12);
    expect(r.r32).toBeCloseTo(1.3333, 4);
    expect(r.order!).toBeCloseTo(1.534, 3);
    expect(r.extrapolated!).toBeCloseTo(6.1685, 4);
    expect(r.approxRelError! * 100).toBeCloseTo(1.50, 2);
    expect(r.extrapRelError! * 100).toBeCloseTo(1.71, 2);
    expect(r.gciFine! * 100).toBeCloseTo(2.175, 3);
    expect(r.gciMedium! * 100).toBeCloseTo(4.113, 3);
    expect(r.asymptoticRatio!).toBeCloseTo(1.015, 3);
  });

  it('a manufactured series φ(h) = φ0 + C·h^p returns φ0 and p exactly', () => {
    // Reference: Richardson extrapolation is exact for a pure power law (mathematical identity).
    for (const [p, r21, r32] of [[2, 2, 2], [1.5, 1.5, 1.3], [3.2, 1.7, 2.1], [0.8, 1.4, 1.6]] as const) {
      const phi0 = 0.1234, C = -0.37, h1 = 0.01, h2 = h1 * r21, h3 = h2 * r32;
      const f = (h: number) => phi0 + C * h ** p;
      const r = gridConvergence({ h: [h1, h2, h3], phi: [f(h1), f(h2), f(h3)] });
      expect(r.kind).toBe('monotonic');
      expect(r.order!).toBeCloseTo(p, 10);
      expect(Math.abs(r.extrapolated! - phi0)).toBeLessThan(1e-12);
    }
  });

  it('flags an oscillating series and a diverging one without forcing numbers', () => {
    const osc = gridConvergence({ h: [1, 2, 4], phi: [1.0, 1.1, 0.95] });
    expect(osc.kind).toBe('oscillatory');
    expect(osc.order).toBeNull();
    expect(osc.gciFine).toBeNull();
    expect(osc.notes.join(' ')).toMatch(/oscillatory/);
    const div = gridConvergence({ h: [1, 2, 4], phi: [1.0, 1.2, 1.3] });
    expect(div.kind).toBe('divergent');
    expect(div.extrapolated).toBeNull();
  });

  it('refuses sizes not ordered fine to coarse', () => {
    expect(() => gridConvergence({ h: [2, 1, 4], phi: [1, 2, 3] })).toThrow(/h1 < h2 < h3/);
  });
});

describe('grid-convergence estimate on a quantity the meshes represent exactly', () => {
  it('values equal to rounding are "converged", not read as oscillation', () => {
    // Reference: the three values differ only by floating-point rounding (1e-13 relative).
    const r = gridConvergence({ h: [1, 1.5, 2.25], phi: [0.40064, 0.40064 * (1 + 3e-14), 0.40064 * (1 - 2e-13)] });
    expect(r.kind).toBe('converged');
    expect(r.gciFine).toBeNull();
  });
});
