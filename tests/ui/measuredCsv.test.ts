/** Measured points for the chart: values and ± uncertainties read back exactly; bad rows named by line. */
import { describe, expect, it } from 'vitest';
import { parseMeasuredCsv } from '../../src/ui/measuredCsv.ts';

describe('parseMeasuredCsv', () => {
  it('reads a header and rows with uncertainties, any separator', () => {
    const m = parseMeasuredCsv('# station 3, hot-wire\nr/R; u [m/s]; ±u\n0;0.1;0.004\n0.5\t0.075\t0.003\n0.9 0.019 0.002\n', 'hw.csv');
    expect(m.columns).toEqual(['r/R', 'u [m/s]', '±u']);
    expect(Array.from(m.x)).toEqual([0, 0.5, 0.9]);
    expect(Array.from(m.y)).toEqual([0.1, 0.075, 0.019]);
    expect(Array.from(m.uncertainty!)).toEqual([0.004, 0.003, 0.002]);
  });

  it('two columns: no uncertainty', () => {
    const m = parseMeasuredCsv('0,1\n1,2\n', 'p.csv');
    expect(m.uncertainty).toBeNull();
    expect(m.columns).toEqual(['x', 'value']);
  });

  it('refuses bad input with the file, the line and what was expected', () => {
    expect(() => parseMeasuredCsv('0,1\n1,2,3\n', 'a.csv')).toThrow('a.csv: line 2: expected 2 numbers like the rows above, got 3');
    expect(() => parseMeasuredCsv('0,1\n1,x\n', 'a.csv')).toThrow('a.csv: line 2: column 2 is not a finite number ("x")');
    expect(() => parseMeasuredCsv('1\n', 'a.csv')).toThrow('a.csv: line 1: expected 2 or 3 numbers (position, value[, uncertainty]), got 1 ("1")');
    expect(() => parseMeasuredCsv('position\n', 'a.csv')).toThrow('a.csv: line 1: expected a header of 2 or 3 names (position, value[, uncertainty]), got 1');
    expect(() => parseMeasuredCsv('# nothing\n', 'a.csv')).toThrow('a.csv: no rows of numbers (expected position, value[, uncertainty] per line)');
    expect(() => parseMeasuredCsv('0,1,-0.1\n', 'a.csv')).toThrow('a.csv: line 1: the uncertainty -0.1 is negative (expected a ± half-width ≥ 0)');
    expect(() => parseMeasuredCsv('a,b\n0,1,2\n', 'a.csv')).toThrow('a.csv: the header names 2 columns, the rows hold 3');
  });
});
