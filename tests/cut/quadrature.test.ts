/**
 * The quadrature rules the integrals rely on.
 * References: ∫ over the reference triangle of x^a y^b = a! b! / (a + b + 2)! (standard barycentric formula, C);
 * Gauss–Legendre 3-point nodes ±√(3/5), 0 and weights 5/9, 8/9 (Abramowitz & Stegun, Table 25.4 — from memory);
 * circular segment of half-angle φ: area R²(φ − sin φ cos φ), first moment about the centre (2/3)R³ sin³φ;
 * full disk polar moment πR⁴/2 (elementary geometry, C).
 */
import { describe, expect, it } from 'vitest';
import { TRI7, circularSegmentRule, gaussLegendre } from '../../src/cut/quadrature.ts';

const fact = (n: number): number => (n <= 1 ? 1 : n * fact(n - 1));

/** x − sin x without cancellation for small x (Taylor series below 1). */
function xMinusSin(x: number): number {
  if (x >= 1) return x - Math.sin(x);
  let term = x * x * x / 6, sum = 0;
  for (let k = 1; Math.abs(term) > 1e-18 * Math.abs(sum); k++) { sum += term; term *= -(x * x) / ((2 * k + 2) * (2 * k + 3)); }
  return sum;
}

describe('7-point triangle rule of degree 3', () => {
  const tri = (f: (x: number, y: number) => number) => {
    let s = 0;
    for (let q = 0; q < TRI7.points; q++) s += 0.5 * TRI7.weight[q]! * f(TRI7.bary[3 * q + 1]!, TRI7.bary[3 * q + 2]!);
    return s;
  };
  it('integrates every monomial of degree ≤ 3 exactly on the reference triangle', () => {
    for (let a = 0; a <= 3; a++) for (let b = 0; a + b <= 3; b++) {
      expect(tri((x, y) => x ** a * y ** b)).toBeCloseTo(fact(a) * fact(b) / fact(a + b + 2), 15);
    }
  });
  it('is not exact for degree 4 (so it is exactly a degree-3 rule)', () => {
    expect(Math.abs(tri((x) => x ** 4) - fact(4) / fact(6))).toBeGreaterThan(1e-4);
  });
});

describe('Gauss–Legendre', () => {
  it('3 points: ±√(3/5), 0 with weights 5/9, 8/9', () => {
    const g = gaussLegendre(3);
    expect(g.x[0]).toBeCloseTo(-Math.sqrt(0.6), 15);
    expect(g.x[1]).toBeCloseTo(0, 15);
    expect(g.w[0]).toBeCloseTo(5 / 9, 15);
    expect(g.w[1]).toBeCloseTo(8 / 9, 15);
  });
  it('n points integrate x^(2n−2) exactly on [−1, 1]', () => {
    for (const n of [2, 4, 8]) {
      const g = gaussLegendre(n);
      let s = 0;
      for (let i = 0; i < n; i++) s += g.w[i]! * g.x[i]! ** (2 * n - 2);
      expect(s).toBeCloseTo(2 / (2 * n - 1), 14);
    }
  });
});

describe('circular segment rule', () => {
  const integrate = (R: number, half: number, f: (s: number, t: number) => number) => {
    const out = { st: new Float64Array(0), w: new Float64Array(0) };
    const n = circularSegmentRule(R, half, out, 0);
    let sum = 0;
    for (let i = 0; i < n; i++) sum += out.w[i]! * f(out.st[2 * i]!, out.st[2 * i + 1]!);
    return sum;
  };
  it('area and first moment of segments from thin to almost the whole disk', () => {
    const R = 0.7;
    for (const phi of [0.05, 0.4, 1, Math.PI / 2, 2.2, 3.1]) {
      const area = 0.5 * R * R * xMinusSin(2 * phi);
      expect(Math.abs(integrate(R, phi, () => 1) - area) / area).toBeLessThan(1e-14);
      const m1 = (2 / 3) * R ** 3 * Math.sin(phi) ** 3;
      // Near the whole disk the first moment cancels almost to zero: compare against the scale R³.
      expect(Math.abs(integrate(R, phi, (s) => s) - m1) / (phi < 3 ? m1 : R ** 3)).toBeLessThan(1e-14);
      expect(Math.abs(integrate(R, phi, (_s, t) => t))).toBeLessThan(1e-16);
    }
  });
  it('the whole disk: area πR² and polar moment πR⁴/2 to rounding', () => {
    const R = 1.3;
    expect(integrate(R, Math.PI, () => 1)).toBeCloseTo(Math.PI * R * R, 13);
    expect(Math.abs(integrate(R, Math.PI, (s, t) => s * s + t * t) / (Math.PI * R ** 4 / 2) - 1)).toBeLessThan(1e-14);
    expect(Math.abs(integrate(R, Math.PI, (s, t) => s * s * t + s * s * s))).toBeLessThan(1e-14);
  });
});
