/** Number formatting for pins, table and exports: 4 significant figures, exponents for extremes, round trip. */
import { describe, expect, it } from 'vitest';
import { formatBytes, formatNumber, parseFormatted, roundToScale, withUnit } from '../../src/ui/format.ts';

describe('formatNumber', () => {
  it('keeps 4 significant figures, trailing zeros included', () => {
    expect(formatNumber(0.0156798)).toBe('0.01568');
    expect(formatNumber(0.25)).toBe('0.2500');
    expect(formatNumber(27692.3)).toBe('27690');
    expect(formatNumber(-4.5)).toBe('-4.500');
  });
  it('switches to exponents outside 1e-3 … 1e5, in two notations', () => {
    expect(formatNumber(1.5459e-5)).toBe('1.546×10⁻⁵');
    expect(formatNumber(1.5459e-5, 4, true)).toBe('1.546e-5');
    expect(formatNumber(123456)).toBe('1.235×10⁵');
  });
  it('never shows a number that was not computed', () => {
    expect(formatNumber(NaN)).toBe('—');
    expect(withUnit(Infinity, 'kg/s')).toBe('—');
    expect(withUnit(0.01568, 'kg/s')).toBe('0.01568 kg/s');
  });
  it('reads back what it writes', () => {
    for (const v of [1.546e-5, 0.01568, -2.75e7, 27690, 3.106e-4]) expect(parseFormatted(formatNumber(v))).toBe(v);
    expect(parseFormatted('—')).toBeNaN();
  });
  it('sizes bytes', () => {
    expect(formatBytes(999)).toBe('999 B');
    expect(formatBytes(22_350_100)).toBe('22.4 MB');
  });
});

describe('roundToScale', () => {
  it('rounds to significant figures of the geometry, not of the value: binary noise goes, the step is the same everywhere', () => {
    // a computed centre of a 0.1 m pipe: 6 figures of 0.1 m is a step of 1e-6 m
    expect(roundToScale(-0.0024999999999999996, 0.1)).toBe(-0.0025);
    expect(String(roundToScale(-0.0024999999999999996, 0.1))).toBe('-0.0025');
    expect(roundToScale(0.30000000000000004, 0.1)).toBe(0.3);
    // noise beside 0 becomes 0 (relative rounding of the value itself would keep 1.3e-17)
    expect(Math.abs(roundToScale(1.3e-17, 0.1))).toBe(0);
    expect(roundToScale(0.12345678, 0.1)).toBe(0.123457);
    // a large geometry: steps above 1
    expect(roundToScale(123456789.4, 2e6)).toBe(123456790);
    expect(roundToScale(-3.5e6 + 0.25, 2e6)).toBe(-3500000);
    // nothing to scale by: unchanged
    expect(roundToScale(0.1 + 0.2, 0)).toBe(0.1 + 0.2);
    expect(roundToScale(NaN, 1)).toBeNaN();
  });
});
