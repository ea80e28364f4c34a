import { describe, expect, it } from 'vitest';
import { parseNumbers } from '../../src/io/asciiNumbers.ts';

const enc = (s: string) => new TextEncoder().encode(s);

describe('parseNumbers', () => {
  it('equals Number() on every token (correct rounding, the ECMAScript reference)', () => {
    const tokens = ['0', '-0', '1', '-17', '3.14159', '1e-7', '-2.5E+10', '0.1', '123456789012345678', '0.30000000000000004',
      '6.02214076e23', '1.7976931348623157e308', '4.9e-324', '+5', '.5', '7.', '1.234567890123456789', '00012.500', '2e-22', '9e22'];
    const out = new Float64Array(tokens.length);
    parseNumbers(enc(' \n' + tokens.join(' \t\n ') + '\n'), 0, Infinity, out, 't');
    expect(Array.from(out)).toEqual(tokens.map(Number));
  });

  it('random decimals round-trip exactly', () => {
    const vals = Array.from({ length: 2000 }, (_, i) => (Math.sin(i * 12.9898) * 43758.5453) % 1 * 10 ** ((i % 40) - 20));
    const text = vals.map((v, i) => (i % 3 === 0 ? v.toExponential(i % 17) : i % 3 === 1 ? String(v) : v.toFixed(i % 12))).join(' ');
    const out = new Float64Array(vals.length);
    parseNumbers(enc(text), 0, text.length, out, 't');
    expect(Array.from(out)).toEqual(text.split(' ').map(Number));
  });

  it('returns nan/inf tokens as values for later validation, rejects garbage with its index', () => {
    const out = new Float64Array(3);
    parseNumbers(enc('nan inf -Infinity'), 0, 17, out, 't');
    expect(Number.isNaN(out[0]!)).toBe(true);
    expect(out[1]).toBe(Infinity);
    expect(out[2]).toBe(-Infinity);
    expect(() => parseNumbers(enc('1 2 x3'), 0, 6, new Float64Array(3), 'f.vtk: POINTS')).toThrow('f.vtk: POINTS: value 2 is "x3", expected a number');
    expect(() => parseNumbers(enc('1 2'), 0, 3, new Float64Array(3), 'f.vtk: POINTS')).toThrow('expected 3 numbers, found only 2');
  });
});
