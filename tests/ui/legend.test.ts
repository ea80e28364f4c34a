/**
 * The colour legend's tick labels are always distinct (issue 13: readable labels at any scale): exact
 * expectations from the evenly spaced values and `formatNumber`'s significant figures (binary-exact ranges).
 */
import { describe, expect, it } from 'vitest';
import { legendTicks } from '../../src/ui/legend.ts';

const texts = (lo: number, hi: number) => legendTicks(lo, hi).map((t) => t.text);

describe('legend ticks', () => {
  it('five evenly spaced labels, high end on top, four significant figures', () => {
    expect(legendTicks(0, 4.5)).toEqual([
      { text: '4.500', at: 0 }, { text: '3.375', at: 0.25 }, { text: '2.250', at: 0.5 }, { text: '1.125', at: 0.75 }, { text: '0', at: 1 },
    ]);
    expect(texts(-4.5, 4.5)).toEqual(['4.500', '2.250', '0', '-2.250', '-4.500']);
  });

  it('a narrow range gets the figures it needs to tell its labels apart', () => {
    // 1 … 1 + 2⁻¹⁰ in steps of 2⁻¹²: at four figures 1.001, 1.001, 1.000, 1.000, 1.000
    expect(texts(1, 1 + 2 ** -10)).toEqual(['1.0010', '1.0007', '1.0005', '1.0002', '1.0000']);
    // 100000 … 100001 in steps of 0.25; the tie 1.0000025 rounds up (ECMA-262 Number.prototype.toExponential)
    expect(texts(1e5, 1e5 + 1)).toEqual(['1.000010×10⁵', '1.000008×10⁵', '1.000005×10⁵', '1.000003×10⁵', '1.000000×10⁵']);
  });

  it('a constant field gets one label in the middle of the bar, not five equal ones', () => {
    expect(legendTicks(0, 0)).toEqual([{ text: '0', at: 0.5 }]);
    expect(legendTicks(998.207, 998.207)).toEqual([{ text: '998.2', at: 0.5 }]);
    // one unit in the last place apart: the same value to 15 figures
    expect(legendTicks(1, 1 + 2 ** -52)).toEqual([{ text: '1.000', at: 0.5 }]);
  });
});
