/**
 * The JSON error locator agrees with the engine's JSON.parse on which texts are valid (reference: the
 * ECMAScript JSON grammar as V8 implements it), and points at the offending character.
 */
import { describe, expect, it } from 'vitest';
import { jsonErrorOffset, lineColumn } from '../../src/study/jsonPosition.ts';

const parses = (t: string): boolean => { try { JSON.parse(t); return true; } catch { return false; } };

describe('jsonErrorOffset', () => {
  it('points at the first character that cannot be accepted', () => {
    expect(jsonErrorOffset('{"a": [1, 2,]}')).toBe(12);
    expect(jsonErrorOffset('{"a" 1}')).toBe(5);
    expect(jsonErrorOffset('[1, 2')).toBe(5);
    expect(jsonErrorOffset('{"a": tru}')).toBe(6);
    expect(jsonErrorOffset('{"a": 1} x')).toBe(9);
    expect(jsonErrorOffset('{"a": "\\q"}')).toBe(8);
    expect(jsonErrorOffset(' {"a": [1e5, -0.5, "x\\u00e9", null, false]} ')).toBe(-1);
    expect(lineColumn('{\n  "a": ,\n}', 9)).toBe('line 2, column 8');
  });

  it('agrees with JSON.parse on valid and broken texts (deterministic mutations of valid documents)', () => {
    const docs = ['{"format":"x","version":2,"probes":[{"id":"a","geometry":{"origin":[0,0,0.05]}}]}', '[true,false,null,-1.5e-3,"q\\"uote"]', '{"é":"\\u0041","n":[[],{}]}'];
    let seed = 12345;
    const rnd = (n: number) => { seed = (seed * 1103515245 + 12345) & 0x7fffffff; return seed % n; };
    const junk = ['', ',', '}', ']', '"', ':', '0', '-', '.', 'e', ' ', '\\', 'x'];
    for (const d of docs) {
      expect(jsonErrorOffset(d)).toBe(-1);
      for (let k = 0; k < 400; k++) {
        const at = rnd(d.length + 1);
        const t = d.slice(0, at) + junk[rnd(junk.length)]! + d.slice(at + rnd(2));
        expect(jsonErrorOffset(t) === -1, t).toBe(parses(t));
      }
    }
  });
});
