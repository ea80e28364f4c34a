import { describe, expect, it } from 'vitest';
import { lombScargle } from '../../src/stats/lombScargle.ts';
import { dominantFrequency, strouhalNumber } from '../../src/stats/spectrum.ts';
import { jitteredTimes, seededNormal } from './gaussian.ts';

const TWO_PI = 2 * Math.PI;

describe('dominant frequency on uneven steps (Lomb 1976 / Scargle 1982 + least-squares sine fit)', () => {
  it('a pure sinusoid on randomly jittered steps: frequency, amplitude and phase to far under one bin', () => {
    // Closed form: x = c + A·cos(2πf(t − t0) + φ) is fitted exactly by the single-tone least-squares model.
    const cases: [number, number, number, number][] = [[1.2345, 2.5, 0.7, 101325], [0.0731, 3e-4, -2.1, 0], [17.9, 4.2e6, 3.0, -1e6]];
    for (const [f, a, phase, c] of cases) {
      const h = 1 / (f * 4); // 4 samples a period on average, steps 0.2h…1.8h
      const t = jitteredTimes(600, h, 0.8, Math.round(f * 1000), 2.0);
      const x = t.map((s) => c + a * Math.cos(TWO_PI * f * (s - 2.0) + phase));
      const r = dominantFrequency(t, x)!;
      expect(r.method).toMatch(/Lomb 1976; Scargle 1982/);
      expect(Math.abs(r.frequency - f) / r.resolution).toBeLessThan(1e-4);
      expect(Math.abs(r.amplitude / a - 1)).toBeLessThan(1e-6);
      expect(Math.abs(Math.atan2(Math.sin(r.phase - phase), Math.cos(r.phase - phase)))).toBeLessThan(1e-5);
      expect(Math.abs(r.offset - c)).toBeLessThan(1e-6 * Math.max(Math.abs(c), a));
      expect(r.cycles).toBeCloseTo(f * (t[t.length - 1]! - 2.0), 3);
    }
  });

  it('with noise: errors within a few Cramér–Rao standard deviations (Rife & Boorstyn 1974, from memory)', () => {
    // Single tone in white noise σ, N samples over T: sd(f) ≈ √6·σ/(2πA·√N·T), sd(A) ≈ σ√(2/N) (C for even steps).
    const n = 1000, f = 2.37, a = 1, sigma = 0.1;
    for (let seed = 1; seed <= 10; seed++) {
      const t = jitteredTimes(n, 0.05, 0.5, seed);
      const g = seededNormal(seed + 50);
      const x = t.map((s) => a * Math.sin(TWO_PI * f * s) + sigma * g());
      const r = dominantFrequency(t, x)!;
      const T = t[n - 1]! - t[0]!;
      const sdF = (Math.sqrt(6) * sigma) / (TWO_PI * a * Math.sqrt(n) * T);
      expect(Math.abs(r.frequency - f)).toBeLessThan(4 * sdF);
      expect(Math.abs(r.frequency - f) / r.resolution).toBeLessThan(0.01);
      expect(Math.abs(r.amplitude - a)).toBeLessThan(4 * sigma * Math.sqrt(2 / n));
    }
  });

  it('two tones: the larger is found and its frequency is not pulled by the other', () => {
    const t = jitteredTimes(800, 0.02, 0.6, 4);
    const x = t.map((s) => 0.4 * Math.sin(TWO_PI * 9.1 * s) + 1.0 * Math.cos(TWO_PI * 3.05 * s) + 0.2);
    const r = dominantFrequency(t, x)!;
    expect(Math.abs(r.frequency - 3.05) / r.resolution).toBeLessThan(0.01);
    expect(r.amplitude).toBeCloseTo(1.0, 2);
    // the spectrum shows both peaks, each near its squared amplitude
    const near = (f: number) => Math.max(...Array.from(r.power).filter((_, k) => Math.abs(r.frequencies[k]! - f) < r.resolution));
    expect(near(3.05)).toBeGreaterThan(0.8);
    expect(near(9.1)).toBeGreaterThan(0.8 * 0.16);
    expect(near(6.0)).toBeLessThan(0.05);
  });

  it('on even steps the Lomb–Scargle power at the Fourier frequencies equals the classical periodogram', () => {
    // Scargle 1982, ApJ 263: for even sampling the periodogram reduces to the classical one (C: at f = k/(NΔ) the
    // sums of cos 2ωt and sin 2ωt vanish, τ = 0 and Σcos² = Σsin² = N/2).
    const n = 64, dt = 0.1, g = seededNormal(2);
    const t = Float64Array.from({ length: n }, (_, i) => i * dt);
    const x = t.map(() => g());
    const mean = x.reduce((s, v) => s + v, 0) / n;
    const df = 1 / (n * dt);
    const p = lombScargle(t, x, 0, n - 1, df, n / 2 - 1, 0);
    for (let k = 1; k < n / 2; k++) {
      let re = 0, im = 0;
      for (let i = 0; i < n; i++) { re += (x[i]! - mean) * Math.cos((TWO_PI * k * i) / n); im -= (x[i]! - mean) * Math.sin((TWO_PI * k * i) / n); }
      expect(p[k - 1]!).toBeCloseTo((re * re + im * im) / n, 10);
    }
  });

  it('uses only the chosen window and flags a tone with fewer than three cycles in it', () => {
    const t = Float64Array.from({ length: 2001 }, (_, i) => i * 0.01);
    const x = t.map((s) => (s < 10 ? Math.sin(TWO_PI * 1.5 * s) : 2 * Math.sin(TWO_PI * 4.25 * s)));
    const late = dominantFrequency(t, x, 10, 20)!;
    expect(late.from).toBe(10);
    expect(late.frequency).toBeCloseTo(4.25, 8);
    expect(late.amplitude).toBeCloseTo(2, 8);
    const short = dominantFrequency(t, x, 0, 1.5)!;
    expect(short.note).toMatch(/cycles in the window/);
  });

  it('no spectrum for a constant history or fewer than 8 samples; bad input is named', () => {
    const t = Float64Array.from({ length: 50 }, (_, i) => i);
    expect(dominantFrequency(t, new Float64Array(50).fill(3))).toBeNull();
    expect(dominantFrequency(t, t.map((s) => Math.sin(s)), 0, 6)).toBeNull();
    expect(() => dominantFrequency(t, new Float64Array(49), undefined, undefined, 'wake.p [Pa]'))
      .toThrow('spectrum of wake.p [Pa]: time has 50 samples, values has 49; expected the same count');
  });
});

describe('Strouhal number', () => {
  it('St = f·L/U', () => {
    // DFG 2D-2 (Schäfer & Turek 1996): St = fD/Ū ≈ 0.30 with D = 0.1 m, Ū = 1 m/s means f ≈ 3 Hz (range from memory)
    expect(strouhalNumber(3.0, 0.1, 1)).toBeCloseTo(0.3, 14);
    expect(strouhalNumber(0, 2, 5)).toBe(0);
  });
  it('refuses lengths and speeds that are not positive', () => {
    expect(() => strouhalNumber(1, 0, 1)).toThrow('Strouhal number: reference length 0 is not a positive number');
    expect(() => strouhalNumber(1, 1, -2)).toThrow('Strouhal number: reference speed -2 is not a positive number');
    expect(() => strouhalNumber(NaN, 1, 1)).toThrow(/frequency NaN/);
  });
});

describe('spectrum on large offsets of time and value', () => {
  it('a 10⁻³ Pa tone on 101 325 Pa at times near 10⁴ s is found to the same precision', () => {
    const t = jitteredTimes(500, 2e-3, 0.5, 31, 1e4);
    const x = t.map((s) => 101325 + 1e-3 * Math.cos(TWO_PI * 37.5 * (s - 1e4) + 1));
    const r = dominantFrequency(t, x)!;
    expect(Math.abs(r.frequency - 37.5) / r.resolution).toBeLessThan(1e-3);
    expect(r.amplitude / 1e-3).toBeCloseTo(1, 4);
  });
});
