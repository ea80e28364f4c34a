/** Chart tick labels: distinct at any scale, one shared ×10ⁿ (n a multiple of 3) in the axis title. */
import { describe, expect, it } from 'vitest';
import { axisTitle, exponentText, sharedExponent, tickLabels } from '../../src/ui/axisTicks.ts';

describe('axis ticks', () => {
  it('a millimetre-scale line reads 0, 0.5, 1.0, … with ×10⁻³ once in the title', () => {
    const ticks = [0, 0.0005, 0.001, 0.0015, 0.002];
    const e = sharedExponent(0.002);
    expect(e).toBe(-3);
    expect(tickLabels(ticks, e)).toEqual(['0.0', '0.5', '1.0', '1.5', '2.0']);
    expect(axisTitle('s', 'm', e)).toBe('s [×10⁻³ m]');
  });

  it('ordinary magnitudes keep no factor; labels carry the decimals their step needs', () => {
    expect(sharedExponent(0.03)).toBe(0);
    expect(tickLabels([0, 0.0025, 0.005, 0.0075, 0.01], sharedExponent(0.01))).toEqual(['0.0000', '0.0025', '0.0050', '0.0075', '0.0100']);
    expect(tickLabels([0.003, 0.005, 0.008], 0)).toEqual(['0.003', '0.005', '0.008']);
    expect(tickLabels([0, 0.5, 1, 1.5], 0)).toEqual(['0.0', '0.5', '1.0', '1.5']);
    expect(tickLabels([-2, 0, 2, 4], 0)).toEqual(['-2', '0', '2', '4']);
    expect(axisTitle('p', 'Pa', 0)).toBe('p [Pa]');
    expect(axisTitle('r/R', '', 0)).toBe('r/R');
  });

  it('large and tiny values share a power of ten in steps of three', () => {
    expect(sharedExponent(27620)).toBe(3);
    expect(tickLabels([20000, 25000, 30000], 3)).toEqual(['20', '25', '30']);
    expect(sharedExponent(4.5e-7)).toBe(-9);
    expect(tickLabels([1e-7, 2e-7, 3e-7], -9)).toEqual(['100', '200', '300']);
    expect(exponentText(-12)).toBe('×10⁻¹²');
    expect(sharedExponent(0)).toBe(0);
  });

  it('labels are always distinct, however close the ticks', () => {
    const t = [1.0001, 1.0002, 1.0003];
    const l = tickLabels(t, 0);
    expect(new Set(l).size).toBe(3);
    expect(l).toEqual(['1.0001', '1.0002', '1.0003']);
  });
});
