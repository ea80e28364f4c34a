/** Number formatting for pins, table and exports: 4 significant figures, exponents for extremes, round trip. */
import { describe, expect, it } from 'vitest';
import { formatBytes, formatNumber, parseFormatted, withUnit } from '../../src/ui/format.ts';

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
