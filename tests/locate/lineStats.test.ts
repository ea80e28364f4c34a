/**
 * Statistics along a line.
 * Reference: the trapezoid rule, worked by hand on small arrays (exact for piecewise-linear data), and
 * the exclusion rule of issue 4: stretches outside the mesh are gaps, left out of every statistic.
 */
import { describe, expect, it } from 'vitest';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { probeLine } from '../../src/locate/lineProbe.ts';
import { lineStats, seriesStats } from '../../src/locate/lineStats.ts';

describe('line statistics', () => {
  it('trapezoid integral, length-weighted mean, min and max over the inside stretches only', () => {
    const s = Float64Array.of(0, 1, 3, 4, 6, 7);
    const f = Float64Array.of(2, 4, NaN, 1, 3, 5);
    const valid = Uint8Array.of(1, 1, 0, 1, 1, 1);
    const inside = Uint8Array.of(1, 0, 0, 1, 1);
    const st = seriesStats(s, f, valid, inside);
    // (2+4)/2·1 + (1+3)/2·2 + (3+5)/2·1 = 3 + 4 + 4.
    expect(st.integral).toBe(11);
    expect(st.coveredLength).toBe(4);
    expect(st.mean).toBe(11 / 4);
    expect(st.min).toBe(1);
    expect(st.max).toBe(5);
    expect(st.validSamples).toBe(5);
  });

  it('isolated valid samples (no inside stretch) give their arithmetic mean and a zero-length integral', () => {
    const st = seriesStats(Float64Array.of(0, 1, 2), Float64Array.of(NaN, 7, NaN), Uint8Array.of(0, 1, 0), Uint8Array.of(0, 0));
    expect(st).toEqual({ validSamples: 1, coveredLength: 0, min: 7, max: 7, mean: 7, integral: 0 });
  });

  it('no valid sample: every statistic is NaN, never zero', () => {
    const st = seriesStats(Float64Array.of(0, 1), Float64Array.of(NaN, NaN), Uint8Array.of(0, 0), Uint8Array.of(0));
    expect(st.min).toBeNaN(); expect(st.mean).toBeNaN(); expect(st.integral).toBeNaN();
  });

  it('vectors get a series per component and one for the magnitude', () => {
    const p = hexGrid(2, 2, 2);
    const d = datasetOf([withFields(p, [pointFieldFrom(p, 'u', 3, (x, _y, _z, o) => { o[0] = 3 * x; o[1] = 4 * x; o[2] = 0; })])]);
    const st = lineStats(probeLine(d, [0, 0.5, 0.5], [1, 0.5, 0.5], { mode: 'crossings' }));
    expect(st.series.map((q) => q.label)).toEqual(['u_x', 'u_y', 'u_z', '|u|']);
    const mag = st.series[3]!.stats;
    // |u| = 5x on [0, 1]: ∫ = 2.5, max 5.
    expect(mag.integral).toBeCloseTo(2.5, 14);
    expect(mag.max).toBeCloseTo(5, 14);
    expect(st.series[3]!.component).toBe(-1);
  });
});
