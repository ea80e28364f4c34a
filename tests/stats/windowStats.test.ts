import { describe, expect, it } from 'vitest';
import { windowStatistics } from '../../src/stats/windowStats.ts';
import { ar1, jitteredTimes, seededNormal } from './gaussian.ts';

/**
 * Exact variance of the mean of N samples of a stationary AR(1) series x_n = φx_{n−1} + e_n, var(e) = s²:
 * var(x̄) = (σx²/N)[1 + 2Σ_{k=1}^{N−1}(1 − k/N)φ^k], σx² = s²/(1 − φ²) — the variance of a sample mean of a
 * stationary series (Priestley 1981, Spectral Analysis and Time Series, §5.3, from memory; C: expand
 * var(Σx_i) with cov(x_i, x_j) = σx²φ^|i−j|). For large N it tends to (σx²/N)(1 + φ)/(1 − φ).
 */
function ar1MeanVariance(n: number, phi: number, s: number): number {
  let sum = 1;
  for (let k = 1; k < n; k++) sum += 2 * (1 - k / n) * phi ** k;
  return ((s * s) / (1 - phi * phi) / n) * sum;
}

function evenTimes(n: number, h = 1): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => i * h);
}

describe('window statistics: mean, rms fluctuation, extremes', () => {
  it('a sinusoid over whole periods on even steps: mean and rms exact (trapezoid rule, discrete orthogonality)', () => {
    // C: on N even steps per period the trapezoid sums of sin and sin² over whole periods are exactly 0 and N/2
    const n = 8 * 40 + 1, h = 1 / 40, a = 2.5, c = -1.25;
    const t = evenTimes(n, h);
    const x = t.map((s) => c + a * Math.sin(2 * Math.PI * s + 0.3));
    const w = windowStatistics(t, x);
    expect(w.samples).toBe(n);
    expect(w.mean).toBeCloseTo(c, 12);
    expect(w.rmsFluctuation).toBeCloseTo(a / Math.SQRT2, 12);
    expect(w.max).toBeCloseTo(c + a, 2);
    expect(w.min).toBeCloseTo(c - a, 2);
  });

  it('a linear history on uneven steps: time mean exact over any window, edges between samples interpolated', () => {
    // C: the trapezoid rule integrates a linear function exactly; the mean of a + b·t over [t0, t1] is a + b(t0 + t1)/2
    const t = jitteredTimes(300, 0.01, 0.6, 11, 1.0);
    const x = t.map((s) => 4 - 3 * s);
    const from = 1.2345, to = 2.71;
    const w = windowStatistics(t, x, from, to);
    expect(w.from).toBe(from);
    expect(w.to).toBe(to);
    expect(w.mean).toBeCloseTo(4 - 3 * (from + to) / 2, 12);
    // rms of a linear ramp over T is |b|T/√12 (C); trapezoid of squares is second-order accurate
    expect(w.rmsFluctuation).toBeCloseTo((3 * (to - from)) / Math.sqrt(12), 3);
    const inside = Array.from(t).filter((s) => s >= from && s <= to).length;
    expect(w.samples).toBe(inside);
  });

  it('std is the N − 1 sample standard deviation of the samples in the window', () => {
    const t = Float64Array.from([0, 0.5, 2, 2.25, 4]);
    const x = Float64Array.from([1, 3, 2, 6, 3]);
    const w = windowStatistics(t, x);
    // mean 3, squared deviations 4 + 0 + 1 + 9 + 0 = 14 over 4 (C)
    expect(w.std).toBeCloseTo(Math.sqrt(14 / 4), 14);
    expect(w.min).toBe(1);
    expect(w.max).toBe(6);
  });

  it('a constant history has zero spread and zero uncertainty', () => {
    const t = evenTimes(100);
    const w = windowStatistics(t, new Float64Array(100).fill(7));
    expect(w.mean).toBe(7);
    expect(w.std).toBe(0);
    expect(w.rmsFluctuation).toBe(0);
    expect(w.meanUncertainty.halfWidth95).toBeCloseTo(0, 12); // batch means agree to rounding
  });
});

describe('uncertainty of the mean for correlated samples', () => {
  it('AR(1) processes: the stated standard error matches the exact variance of the mean and the 95 % interval covers ≈ 95 %', () => {
    // Closed form above (Priestley 1981, from memory; C). 400 seeds per case: the coverage of a true 95 % interval
    // has a binomial standard deviation of 1.1 %, so [0.92, 0.98] is a ±2.7σ band.
    for (const [n, phi] of [[4000, 0], [4000, 0.8], [4000, 0.95]] as const) {
      const t = evenTimes(n);
      const exact = ar1MeanVariance(n, phi, 1);
      let covered = 0, se2 = 0;
      const seeds = 400;
      for (let seed = 1; seed <= seeds; seed++) {
        const w = windowStatistics(t, ar1(n, phi, 1, seed));
        expect(w.meanUncertainty.kind).toBe('batch-means');
        expect(w.meanUncertainty.method).toMatch(/batch means \(Schmeiser 1982\)/);
        if (Math.abs(w.mean) <= w.meanUncertainty.halfWidth95) covered++;
        se2 += w.meanUncertainty.standardError ** 2;
      }
      expect(covered / seeds).toBeGreaterThanOrEqual(0.92);
      expect(covered / seeds).toBeLessThanOrEqual(0.98);
      // batch means are biased low by about T_I/batch length (≤ 10 % by the rule); sampling spread ≈ 1.6 %
      expect(se2 / seeds / exact).toBeGreaterThan(0.85);
      expect(se2 / seeds / exact).toBeLessThan(1.1);
    }
  });

  it('AR(1) integral time: T_I = ½(1 + φ)/(1 − φ) steps (C, from Σρ_k = φ/(1 − φ))', () => {
    const n = 20000, phi = 0.8;
    const w = windowStatistics(evenTimes(n, 0.1), ar1(n, phi, 1, 5));
    const expected = 0.5 * ((1 + phi) / (1 - phi)) * 0.1;
    expect(Math.abs(w.meanUncertainty.integralTime / expected - 1)).toBeLessThan(0.1);
  });

  it('an Ornstein–Uhlenbeck process on uneven steps: coverage ≈ 95 % against the exact variance of its time mean', () => {
    // OU with correlation e^{−|s|/τ} sampled exactly at uneven times (x_{i} = a x_{i−1} + √(1 − a²) e, a = e^{−Δt/τ}).
    // Variance of the time mean over T: 2σ²τ²/T²·(T/τ − 1 + e^{−T/τ}) (C: double integral of the correlation;
    // Bendat & Piersol, Random Data, give the large-T form 2σ²T_I/T, from memory).
    const n = 4000, tau = 2, seeds = 400;
    let covered = 0, ratio = 0;
    for (let seed = 1; seed <= seeds; seed++) {
      const t = jitteredTimes(n, 0.1, 0.5, seed);
      const g = seededNormal(1000 + seed);
      const x = new Float64Array(n);
      x[0] = g();
      for (let i = 1; i < n; i++) {
        const a = Math.exp(-(t[i]! - t[i - 1]!) / tau);
        x[i] = a * x[i - 1]! + Math.sqrt(1 - a * a) * g();
      }
      const w = windowStatistics(t, x);
      const T = t[n - 1]! - t[0]!;
      ratio += w.meanUncertainty.standardError ** 2 / ((2 * tau * tau) / (T * T) * (T / tau - 1 + Math.exp(-T / tau)));
      if (Math.abs(w.mean) <= w.meanUncertainty.halfWidth95) covered++;
    }
    expect(covered / seeds).toBeGreaterThanOrEqual(0.91);
    expect(covered / seeds).toBeLessThanOrEqual(0.98);
    expect(ratio / seeds).toBeGreaterThan(0.85);
    expect(ratio / seeds).toBeLessThan(1.1);
  });

  it('a short correlated record falls back to the effective sample size and says the estimate is weak', () => {
    // 400 samples of φ = 0.9 span ~21 integral times: too few for 10 batches of 10 T_I
    const n = 400, phi = 0.9, seeds = 200;
    const exact = ar1MeanVariance(n, phi, 1);
    let se2 = 0, fallbacks = 0;
    for (let seed = 1; seed <= seeds; seed++) {
      const u = windowStatistics(evenTimes(n), ar1(n, phi, 1, seed)).meanUncertainty;
      se2 += u.standardError ** 2;
      // a seed whose estimated T_I comes out short may still qualify for batch means
      if (u.kind !== 'integral-time') continue;
      fallbacks++;
      expect(u.method).toMatch(/Bayley & Hammersley 1946/);
      expect(u.note).toMatch(/integral times/);
      expect(u.degreesOfFreedom).toBe(Math.max(1, Math.floor(u.effectiveSamples) - 1));
    }
    expect(fallbacks / seeds).toBeGreaterThan(0.9);
    expect(se2 / seeds / exact).toBeGreaterThan(0.75);
    expect(se2 / seeds / exact).toBeLessThan(1.25);
  });

  it('white noise: standard error σ/√N with 19 degrees of freedom from 20 batches', () => {
    const n = 2000, g = seededNormal(3);
    const x = Float64Array.from({ length: n }, () => 2 * g());
    const u = windowStatistics(evenTimes(n), x).meanUncertainty;
    expect(u.batches).toBe(20);
    expect(u.degreesOfFreedom).toBe(19);
    // the batch estimate of σ²/N has 19 degrees of freedom: relative spread √(2/19) ≈ 32 % in variance
    expect(u.standardError / (2 / Math.sqrt(n))).toBeGreaterThan(0.6);
    expect(u.standardError / (2 / Math.sqrt(n))).toBeLessThan(1.4);
    expect(u.halfWidth95 / u.standardError).toBeCloseTo(2.093, 3); // t(0.975, 19), NIST table, from memory
  });
});

describe('window statistics: bad input', () => {
  const t = evenTimes(10), x = new Float64Array(10);
  it('names what is wrong and what was expected', () => {
    expect(() => windowStatistics(t, new Float64Array(9), undefined, undefined, 'drag.Fx [N]')).toThrow(
      'window statistics of drag.Fx [N]: time has 10 samples, values has 9; expected the same count');
    const back = t.slice(); back[4] = 3;
    expect(() => windowStatistics(back, x)).toThrow(/time\[4\] = 3 does not follow time\[3\] = 3; expected strictly increasing times/);
    const nan = x.slice(); nan[2] = NaN;
    expect(() => windowStatistics(t, nan)).toThrow(/values\[2\] \(time 2\) is NaN; expected a finite number/);
    expect(() => windowStatistics(t, x, 3.5, 4.5)).toThrow(/window \[3.5, 4.5\] holds 1 samples; at least 3 expected/);
    expect(() => windowStatistics(t, x, 20, 30)).toThrow(/does not overlap the record \[0, 9\]/);
    expect(() => windowStatistics(t, x, 5, 2)).toThrow(/does not overlap/);
  });
});

describe('window statistics on a large offset and tiny windows', () => {
  it('101 325 Pa + an AR(1) fluctuation of 10⁻³ Pa: the same spread and uncertainty as the fluctuation alone', () => {
    const n = 4000;
    const t = Float64Array.from({ length: n }, (_, i) => 5e3 + i * 1e-3);
    const x = ar1(n, 0.8, 1e-3, 77);
    const a = windowStatistics(t, x), b = windowStatistics(t, x.map((v) => 101325 + v));
    expect(b.mean - 101325).toBeCloseTo(a.mean, 9);
    expect(b.rmsFluctuation / a.rmsFluctuation).toBeCloseTo(1, 6);
    expect(b.meanUncertainty.standardError / a.meanUncertainty.standardError).toBeCloseTo(1, 4);
    expect(b.meanUncertainty.integralTime / a.meanUncertainty.integralTime).toBeCloseTo(1, 4);
  });

  it('three samples: statistics with the effective-sample method and one degree of freedom at least', () => {
    const w = windowStatistics(Float64Array.from([0, 1, 3]), Float64Array.from([1, 2, 0]));
    // trapezoid: (1.5·1 + 1·2)/3 = 7/6 (C)
    expect(w.mean).toBeCloseTo(7 / 6, 14);
    expect(w.meanUncertainty.kind).toBe('integral-time');
    expect(w.meanUncertainty.degreesOfFreedom).toBeGreaterThanOrEqual(1);
    expect(Number.isFinite(w.meanUncertainty.halfWidth95)).toBe(true);
  });
});
