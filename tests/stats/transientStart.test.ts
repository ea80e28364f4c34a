import { describe, expect, it } from 'vitest';
import { detectTransientEnd } from '../../src/stats/transientStart.ts';
import { jitteredTimes, seededNormal } from './gaussian.ts';

// MSER-5: White 1997, Simulation 69(6) (method as recalled from the paper and from White, Cobb & Spratt 2000, from memory).

describe('initial transient by MSER-5 (White 1997)', () => {
  it('a level shift at a known step: truncated exactly there', () => {
    // First 200 samples offset by 5σ, then stationary white noise: the known truncation point is sample 200.
    const n = 1000, g = seededNormal(5);
    const t = Float64Array.from({ length: n }, (_, i) => i);
    const x = t.map((i) => (i < 200 ? 5 : 0) + g());
    const r = detectTransientEnd(t, x);
    expect(r.index).toBe(200);
    expect(r.time).toBe(200);
    expect(r.method).toBe('MSER-5 (White 1997)');
    expect(r.note).toBeUndefined();
  });

  it('a synthetic start-up 10·e^{−t/τ} + noise on uneven steps: the bias left is below the standard error of the kept mean', () => {
    // Closed form (C): the mean bias left after truncating at t_c is ∫_{t_c}^{T} 10e^{−t}dt/(T − t_c); the noise
    // (σ = 1, independent) gives the kept mean a standard error 1/√(samples kept). MSER balances the two, so the
    // cut falls where the transient has sunk to about the noise level (10e^{−t} = 1 at t = ln 10 = 2.3) and
    // before it is far below the standard error (10e^{−6} = 0.025 ≈ 1/√1800).
    for (let seed = 1; seed <= 40; seed++) {
      const t = jitteredTimes(2000, 0.025, 0.5, seed);
      const g = seededNormal(seed + 99);
      const x = t.map((s) => 10 * Math.exp(-s) + g());
      const r = detectTransientEnd(t, x);
      const T = t[t.length - 1]!;
      const bias = (10 * (Math.exp(-r.time) - Math.exp(-T))) / (T - r.time);
      const se = 1 / Math.sqrt(t.length - r.index);
      expect(bias).toBeLessThan(1.5 * se);
      expect(r.time).toBeGreaterThan(1.5);
      expect(r.time).toBeLessThan(6);
      expect(t[r.index]!).toBeGreaterThanOrEqual(r.time);
    }
  });

  it('uneven steps: a transient stepped finely weighs by its duration, not by its sample count', () => {
    // 800 samples crowd the first 20 s (offset 5), 200 samples span the next 79.6 s (noise only): the cut is at 20 s;
    // counted by samples, 80 % of the record would be transient and MSER could not cut past the half-record limit.
    const g = seededNormal(8);
    const t = new Float64Array(1000);
    for (let i = 0; i < 1000; i++) t[i] = i < 800 ? i * 0.025 : 20 + (i - 800) * 0.4;
    const x = t.map((s) => (s < 20 ? 5 : 0) + g());
    const r = detectTransientEnd(t, x);
    expect(r.time).toBeGreaterThan(20 - 0.1); // within one even resampling step (99.6 s / 999)
    expect(r.time).toBeLessThan(21);
  });

  it('a drifting record has no steady part and says so', () => {
    const t = Float64Array.from({ length: 1000 }, (_, i) => i);
    const g = seededNormal(1);
    const r = detectTransientEnd(t, t.map((i) => 0.01 * i + 0.1 * g()));
    expect(r.note).toMatch(/no steady part found/);
    expect(r.index).toBe(500);
  });

  it('few samples: plain MSER, and no truncation below 8 samples', () => {
    const t = Float64Array.from({ length: 30 }, (_, i) => i);
    const r = detectTransientEnd(t, t.map((i) => (i < 6 ? 3 : (i % 2) * 0.1)));
    expect(r.method).toBe('MSER (White 1997)');
    expect(r.index).toBe(6);
    const short = detectTransientEnd(Float64Array.from([0, 1, 2]), Float64Array.from([5, 1, 1]));
    expect(short.index).toBe(0);
    expect(short.note).toMatch(/only 3 samples/);
  });

  it('bad input gives a one-line error naming the quantity', () => {
    expect(() => detectTransientEnd(Float64Array.from([0, 1, 1]), Float64Array.from([1, 2, 3]), 'lift.Fy [N]'))
      .toThrow('transient detection of lift.Fy [N]: time[2] = 1 does not follow time[1] = 1; expected strictly increasing times');
  });
});

describe('MSER-5 on a large offset', () => {
  it('finds the same cut on 101 325 Pa + small fluctuations as on the fluctuations alone', () => {
    // an absolute pressure: 10⁻³ Pa noise on 101 325 Pa, with a 5·10⁻³ Pa start-up offset for 200 samples
    const n = 1000, g = seededNormal(12);
    const t = Float64Array.from({ length: n }, (_, i) => i * 1e-3 + 1e4);
    const fluct = t.map((_, i) => (i < 200 ? 5e-3 : 0) + 1e-3 * g());
    const r0 = detectTransientEnd(t, fluct);
    const r1 = detectTransientEnd(t, fluct.map((v) => 101325 + v));
    expect(r0.index).toBe(200);
    expect(r1.index).toBe(200);
  });
});
