/** The chart's x measure: arc length, a coordinate, or r/L from a point; exact on a straight line. */
import { describe, expect, it } from 'vitest';
import { xName, xProblem, xValues } from '../../src/ui/chartAxis.ts';

const line = { s: new Float64Array([0, 0.005, 0.01]), x: new Float64Array([-0.005, 0, 0.005]), y: new Float64Array(3), z: new Float64Array([0.07, 0.07, 0.07]) };

describe('xValues', () => {
  it('arc length, coordinates, and distance from a point over a length (r/R across a pipe of R = 10 mm)', () => {
    expect(xValues({ measure: 's', point: [0, 0, 0], length: 1 }, line)).toBe(line.s);
    expect(Array.from(xValues({ measure: 'x', point: [0, 0, 0], length: 1 }, line))).toEqual([-0.005, 0, 0.005]);
    expect(Array.from(xValues({ measure: 'distance', point: [0, 0, 0.07], length: 0.01 }, line))).toEqual([0.5, 0, 0.5]);
    expect(xName({ measure: 'distance', point: [0, 0, 0.07], length: 0.01 })).toEqual({ name: 'r/L from (0, 0, 0.07), L = 0.01 m', unit: '' });
    expect(xName({ measure: 'distance', point: [0, 0, 0], length: 1 })).toEqual({ name: 'r from (0, 0, 0)', unit: 'm' });
    expect(xName({ measure: 's', point: [0, 0, 0], length: 1 })).toEqual({ name: 'arc length s', unit: 'm' });
  });
  it('refuses a length that is not positive', () => {
    expect(xProblem({ measure: 'distance', point: [0, 0, 0], length: 0 })).toBe('the length 0 must be a positive number');
    expect(xProblem({ measure: 'distance', point: [0, NaN, 0], length: 1 })).toBe('the point (0, NaN, 0) needs three finite numbers');
  });
});
