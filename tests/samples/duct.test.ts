/**
 * The duct sample: the series solution and its numbers.
 * Reference: docs/references.md §2 — series form (M, White §3-3) checked here as the C entry says:
 * ∇²u = −G/μ, zero on the walls, integrates to Q; Q formula (V, Saadatian & Wong 2020); Darcy fRe table
 * (C; 56.908 at α* = 1 also V via a secondary table to 3 digits); square duct u_max/V = 2.0963, α = 2.154,
 * β = 1.378 (C).
 */
import { describe, expect, it } from 'vitest';
import { findField } from '../../src/model/piece.ts';
import { cellCentroids } from '../../src/samples/cellMeasures.ts';
import { ductCase, ductExact, ductFlowPerGradient, ductVelocity, ductVelocityForm } from '../../src/samples/duct.ts';

/** Gauss–Legendre nodes and weights on [−1, 1] (Newton on P_n). */
function gaussLegendre(n: number): { x: number[]; w: number[] } {
  const x: number[] = [], w: number[] = [];
  for (let i = 1; i <= n; i++) {
    let t = Math.cos((Math.PI * (i - 0.25)) / (n + 0.5)), dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1, p1 = t;
      for (let k = 2; k <= n; k++) { const p2 = ((2 * k - 1) * t * p1 - (k - 1) * p0) / k; p0 = p1; p1 = p2; }
      dp = (n * (t * p1 - p0)) / (t * t - 1);
      const dt = p1 / dp;
      t -= dt;
      if (Math.abs(dt) < 1e-16) break;
    }
    x.push(t); w.push(2 / ((1 - t * t) * dp * dp));
  }
  return { x, w };
}

/** ∫∫ f(u(x, y)) over the section by composite Gauss–Legendre (panels × points per direction). */
function integrate(e: { a: number; b: number; G: number; mu: number }, f: (u: number) => number, panels = 8, pts = 12): number {
  const g = gaussLegendre(pts);
  let s = 0;
  const hx = (2 * e.a) / panels, hy = (2 * e.b) / panels;
  for (let i = 0; i < panels; i++) for (let j = 0; j < panels; j++) {
    for (let p = 0; p < pts; p++) for (let q = 0; q < pts; q++) {
      const x = -e.a + hx * (i + 0.5 + 0.5 * g.x[p]!), y = -e.b + hy * (j + 0.5 + 0.5 * g.x[q]!);
      s += g.w[p]! * g.w[q]! * f(ductVelocity(e, x, y)) * (hx / 2) * (hy / 2);
    }
  }
  return s;
}

/** Deterministic pseudo-random numbers in [0, 1). */
function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => { s = (Math.imul(s, 1664525) + 1013904223) >>> 0; return s / 2 ** 32; };
}

describe('duct series solution (docs/references.md §2)', () => {
  it('∇²u = −G/μ at random interior points (finite differences), square and 2:1 ducts', () => {
    const rand = rng(7);
    for (const [a, b] of [[0.005, 0.005], [0.0025, 0.005], [0.005, 0.0025]] as const) {
      const e = ductExact({ halfWidth: a, halfHeight: b });
      const h = 1e-3 * Math.min(a, b);
      for (let k = 0; k < 40; k++) {
        const x = (2 * rand() - 1) * (a - 2 * h), y = (2 * rand() - 1) * (b - 2 * h);
        const u = (p: number, q: number) => ductVelocity(e, p, q);
        const lapH = (s: number) => (u(x + s, y) - 2 * u(x, y) + u(x - s, y) + u(x, y + s) - 2 * u(x, y) + u(x, y - s)) / (s * s);
        // Richardson extrapolation removes the O(h²) error, which is large near the corners.
        const lap = (4 * lapH(h / 2) - lapH(h)) / 3;
        expect(lap / (-e.G / e.mu)).toBeCloseTo(1, 6);
      }
    }
  });

  it('both series forms agree to 1e-12 at random points, and vanish at the walls', () => {
    const rand = rng(11);
    const e = ductExact({ halfWidth: 0.004, halfHeight: 0.006 });
    const scale = e.uMax;
    for (let k = 0; k < 200; k++) {
      const x = (2 * rand() - 1) * e.a * 0.999, y = (2 * rand() - 1) * e.b * 0.999;
      expect(Math.abs(ductVelocityForm(e, x, y, 'x') - ductVelocityForm(e, x, y, 'y')) / scale).toBeLessThan(1e-12);
    }
    // Approaching each wall with the series whose cosh terms decay there (the shortcut for points on a wall is not used).
    for (const t of [0, 0.3, 0.9]) {
      expect(Math.abs(ductVelocityForm(e, e.a * (1 - 1e-9), t * e.b, 'x')) / scale).toBeLessThan(1e-8);
      expect(Math.abs(ductVelocityForm(e, t * e.a, -e.b * (1 - 1e-9), 'y')) / scale).toBeLessThan(1e-8);
    }
    expect(ductVelocity(e, e.a, 0.001)).toBe(0);
    expect(ductVelocity(e, -0.001, -e.b)).toBe(0);
  });

  it('the velocity integrates to Q of the closed-form series (Saadatian & Wong 2020)', () => {
    for (const [a, b] of [[0.005, 0.005], [0.0025, 0.005]] as const) {
      const e = ductExact({ halfWidth: a, halfHeight: b });
      const Q = integrate(e, (u) => u);
      expect(Q / e.Q).toBeCloseTo(1, 9);
      expect(ductFlowPerGradient(a, b, e.mu)).toBeCloseTo(ductFlowPerGradient(b, a, e.mu), 20);
    }
  });

  it('Darcy fRe matches the table: 56.908 (α* = 1), 62.192 (0.5), 72.931 (0.25), 84.676 (0.1)', () => {
    // Reference: rectangular-duct series, docs/references.md §2 Darcy fRe table (C); Fanning 14.227 at α* = 1.
    const table: [number, number][] = [[1, 56.908], [0.5, 62.192], [0.25, 72.931], [0.1, 84.676]];
    for (const [ratio, fRe] of table) {
      const e = ductExact({ halfWidth: 0.005 * ratio, halfHeight: 0.005 });
      expect(e.fRe).toBeCloseTo(fRe, 3);
    }
    expect(ductExact().fReFanning).toBeCloseTo(14.227, 3);
  });

  it('square duct: u_max/V = 2.0963, α = 2.154, β = 1.378', () => {
    // Reference: docs/references.md §2, square duct (C).
    const e = ductExact();
    expect(e.uMax / e.V).toBeCloseTo(2.0963, 4);
    const beta = integrate(e, (u) => u * u) / (e.V ** 2 * e.area);
    const alpha = integrate(e, (u) => u * u * u) / (e.V ** 3 * e.area);
    expect(beta).toBeCloseTo(1.378, 3);
    expect(alpha).toBeCloseTo(2.154, 3);
  });

  it('hydraulic diameter, Reynolds number and mean wall shear stress of the default channel', () => {
    const e = ductExact();
    expect(e.Dh).toBeCloseTo(0.01, 15);
    // Water at 20 °C: ρ = 998.207 kg/m³, μ = 1.0016 mPa·s, computed from the IAPWS-95 and IAPWS-2008
    // formulations (docs/references.md §10), not read from a printed table.
    expect(e.Re).toBeCloseTo((998.207 * 0.05 * 0.01) / 1.0016e-3, 9);
    // Force balance on the fluid: G·A = τ̄·P.
    expect(e.wallShearStress * 8 * e.a).toBeCloseTo(e.G * e.area, 15);
  });
});

describe('duct sample dataset', () => {
  it('point data: exact values at the nodes, zero on all four walls', () => {
    const d = ductCase({ nx: 8, ny: 6, nz: 4 }), e = ductExact(), p = d.pieces[0]!;
    const u = findField(p, 'velocity', 'point')!.values, pr = findField(p, 'p', 'point')!.values;
    let wall = 0;
    for (let i = 0; i < p.points.length / 3; i++) {
      const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
      expect(u[3 * i + 2]).toBe(ductVelocity(e, x, y));
      expect(pr[i]).toBeCloseTo(e.G * (e.L - z), 14);
      if (Math.abs(x) === e.a || Math.abs(y) === e.b) { wall++; expect(u[3 * i + 2]).toBe(0); }
    }
    expect(wall).toBe((2 * 9 + 2 * 5) * 5);
  });

  it('cell data: exact values at the cell centroids; Float32 when asked', () => {
    const d = ductCase({ nx: 4, ny: 4, nz: 2, association: 'cell', precision: 'Float32' }), e = ductExact(), p = d.pieces[0]!;
    const c = cellCentroids(p), u = findField(p, 'velocity', 'cell')!;
    expect(u.values).toBeInstanceOf(Float32Array);
    for (let i = 0; i < p.cellTypes.length; i++) expect(u.values[3 * i + 2]).toBe(Math.fround(ductVelocity(e, c[3 * i]!, c[3 * i + 1]!)));
  });
});
