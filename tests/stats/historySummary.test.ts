import { describe, expect, it } from 'vitest';
import { summarizeHistory } from '../../src/stats/historySummary.ts';
import { jitteredTimes, seededNormal } from './gaussian.ts';

describe('history summary: transient, window statistics, spectrum and Strouhal number together', () => {
  // Synthetic shedding drag: start-up 2·e^{−t/0.8} on a mean of 1.3, a 2.5 Hz swing of 0.2 and noise (closed form).
  const t = jitteredTimes(3000, 0.01, 0.5, 21);
  const g = seededNormal(21);
  const v = t.map((s) => 1.3 + 2 * Math.exp(-s / 0.8) + 0.2 * Math.sin(2 * Math.PI * 2.5 * s) + 0.02 * g());

  it('starts the window at the detected transient end and recovers mean, swing and Strouhal number', () => {
    const s = summarizeHistory(t, v, { referenceLength: 0.12, referenceSpeed: 1.0 });
    expect(s.windowSource).toBe('transient-detection');
    expect(s.stats.from).toBe(s.transient.time);
    // the transient has sunk below the swing well before 5 s (2e^{−5/0.8} = 0.004)
    expect(s.transient.time).toBeLessThan(5);
    expect(Math.abs(s.stats.mean - 1.3)).toBeLessThan(3 * s.stats.meanUncertainty.halfWidth95 + 0.005);
    // rms of the swing 0.2/√2 plus noise 0.02 in quadrature (C)
    expect(s.stats.rmsFluctuation).toBeCloseTo(Math.hypot(0.2 / Math.SQRT2, 0.02), 2);
    expect(s.spectrum!.frequency).toBeCloseTo(2.5, 3);
    expect(s.spectrum!.amplitude).toBeCloseTo(0.2, 2);
    expect(s.strouhal!).toBeCloseTo((2.5 * 0.12) / 1.0, 3);
  });

  it('a window the user gives overrides the detection', () => {
    const s = summarizeHistory(t, v, { from: 10, to: 25 });
    expect(s.windowSource).toBe('user');
    expect(s.stats.from).toBe(10);
    expect(s.stats.to).toBe(25);
    expect(s.spectrum!.from).toBe(10);
    expect(s.strouhal).toBeNull();
  });

  it('a short decaying record with no steady part still gets a window of at least three samples, and says why', () => {
    // 8 uneven steps of e^{−0.79t} (a decaying vortex): MSER finds no steady part and cuts late
    const tt = Float64Array.from([0, 0.05, 0.15, 0.3, 0.5, 0.8, 1.2, 1.7]);
    const s = summarizeHistory(tt, tt.map((x) => Math.exp(-0.789568 * x)));
    expect(s.transient.note).toMatch(/no steady part found/);
    // the cut at 1.2 s (even resampling, then the next sample) would leave 2 samples: the window takes the last 3
    expect(s.transient.time).toBe(1.2);
    expect(s.stats.from).toBe(0.8);
    expect(s.stats.samples).toBe(3);
    expect(s.windowNote).toBe('the detected transient end (1.2) leaves fewer than 3 samples: the window starts at 0.8 instead');
  });
});
