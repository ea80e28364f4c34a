import { describe, expect, it } from 'vitest';
import { scratchFloat32 } from '../../src/model/scratchMemory.ts';

describe('scratch memory outside malloc', () => {
  it('gives zeroed Float32 arrays of the asked length that hold what is written, of any size up to a 32-bit memory', () => {
    for (const n of [0, 1, 16383, 16384, 16385, 3 * 16384 + 7, 1_000_003]) {
      const a = scratchFloat32(n);
      expect(a).toBeInstanceOf(Float32Array);
      expect(a.length).toBe(n);
      expect(a.every((v) => v === 0)).toBe(true);
      for (let i = 0; i < n; i += 997) a[i] = i + 0.5;
      for (let i = 0; i < n; i += 997) expect(a[i]).toBe(i + 0.5);
    }
    // each call is its own memory: writing one leaves another untouched
    const a = scratchFloat32(100), b = scratchFloat32(100);
    a.fill(3);
    expect(b.every((v) => v === 0)).toBe(true);
  });
});
