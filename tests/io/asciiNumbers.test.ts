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

describe('parseNumbers on long mantissas', () => {
  it('16–19 significant digits and exponents up to ±44 equal Number() (shortest round-trip output, 200k values)', () => {
    // Reference: ECMAScript Number() is correctly rounded (IEEE 754 round-to-nearest-even).
    let seed = 12345;
    const rand = () => { seed = (seed * 1103515245 + 12345) % 2147483648; return seed / 2147483648; };
    const tokens: string[] = [];
    for (let i = 0; i < 200000; i++) {
      const v = (rand() - 0.5) * 10 ** Math.floor(rand() * 80 - 40);
      tokens.push(i % 4 === 0 ? String(v) : i % 4 === 1 ? v.toExponential(15 + (i % 4)) : i % 4 === 2 ? v.toPrecision(17) : v.toExponential(18));
    }
    // Halfway cases: 2^53 + 1 and its neighbours are exact ties between two doubles.
    tokens.push('9007199254740993', '9007199254740995', '9007199254740993.0000', '1.7976931348623157e308', '2.2250738585072014e-308');
    const text = tokens.join('\n');
    const out = new Float64Array(tokens.length);
    parseNumbers(new TextEncoder().encode(text), 0, text.length, out, 't');
    let bad = 0;
    tokens.forEach((t, i) => { if (!Object.is(out[i], Number(t))) bad++; });
    expect(bad).toBe(0);
  });
});
