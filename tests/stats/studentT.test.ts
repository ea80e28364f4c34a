import { describe, expect, it } from 'vitest';
import { studentQuantile, studentTwoSidedProbability } from '../../src/stats/studentT.ts';

describe('Student t quantile (Abramowitz & Stegun 1964, eqs. 26.7.3–26.7.4)', () => {
  it('matches the closed forms for 1 and 2 degrees of freedom', () => {
    // ν = 1 is the Cauchy distribution: t = tan(π·c/2); ν = 2: P(|T| ≤ t) = t/√(2 + t²) (both C, exact)
    for (const c of [0.5, 0.9, 0.95, 0.99]) {
      expect(studentQuantile(c, 1)).toBeCloseTo(Math.tan((Math.PI * c) / 2), 9);
      expect(studentQuantile(c, 2)).toBeCloseTo(c * Math.sqrt(2 / (1 - c * c)), 10);
    }
  });

  it('reproduces the two-sided 95 % critical values of the standard t table', () => {
    // NIST/SEMATECH e-Handbook of Statistical Methods, Table 1.3.6.7.2 (upper 0.025 critical values), from memory
    const table: [number, number][] = [[1, 12.706], [2, 4.303], [3, 3.182], [5, 2.571], [9, 2.262], [10, 2.228], [19, 2.093], [30, 2.042], [100, 1.984]];
    for (const [dof, t] of table) expect(studentQuantile(0.95, dof)).toBeCloseTo(t, 3);
  });

  it('tends to the normal quantile 1.959964 for many degrees of freedom', () => {
    // Φ⁻¹(0.975) = 1.959964 (normal table, from memory); t_ν = z + (z³ + z)/(4ν) + … (A&S 26.7.5)
    const z = 1.959964;
    expect(studentQuantile(0.95, 50_000)).toBeCloseTo(z + (z ** 3 + z) / (4 * 50_000), 5);
  });

  it('is a probability that grows with t and inverts exactly', () => {
    for (const dof of [1, 4, 7, 12, 33]) {
      let prev = 0;
      for (let t = 0; t < 20; t += 0.5) {
        const p = studentTwoSidedProbability(t, dof);
        expect(p).toBeGreaterThanOrEqual(prev);
        expect(p).toBeLessThanOrEqual(1);
        prev = p;
      }
      expect(studentTwoSidedProbability(studentQuantile(0.9, dof), dof)).toBeCloseTo(0.9, 12);
    }
  });

  it('refuses a coverage outside (0, 1) or fewer than one degree of freedom', () => {
    expect(() => studentQuantile(1, 5)).toThrow(/coverage 1 is not in \(0, 1\)/);
    expect(() => studentQuantile(0.95, 0)).toThrow(/0 degrees of freedom/);
  });
});
