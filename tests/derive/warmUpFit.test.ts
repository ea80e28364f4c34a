import { describe, expect, it } from 'vitest';
import { warmUpFitKernels } from '../../src/derive/warmUpFit.ts';
import { pointGradientAt } from '../../src/derive/fieldGradient.ts';
import { pointGradientRange } from '../../src/derive/rangeGradient.ts';
import { hexGrid, pointFieldFrom, tetGrid } from '../../src/model/meshBuild.ts';

describe('warming the gradient fit', () => {
  it('runs once per thread and leaves no state behind: the same gradients, bit for bit, before and after', async () => {
    // Reference: f = x² + 2yz has ∇f = (2x, 2z, 2y); the quadratic fit is exact for quadratics (k-exact, k = 2:
    // Barth & Frederickson 1990), so every node's gradient is that to rounding, before and after the warm-up.
    const p = tetGrid(5, 4, 3, (u, v, w) => [u, 0.8 * v + 0.1 * u, 0.6 * w]);
    const f = pointFieldFrom(p, 'f', 1, (x, y, z, o) => { o[0] = x * x + 2 * y * z; });
    const np = p.points.length / 3, wall = Int32Array.from({ length: np }, (_, i) => i).filter((i) => p.points[3 * i + 2] === 0);
    const range = (): Float64Array => { const g = new Float64Array(3 * np); pointGradientRange(p, f.values, 1, 0, np, g); return g; };
    const beforeRange = range(), beforeAt = pointGradientAt(p, f, wall);
    const a = warmUpFitKernels(), b = warmUpFitKernels();
    expect(a).toBe(b);
    await a;
    expect(range()).toEqual(beforeRange);
    expect(pointGradientAt(p, f, wall)).toEqual(beforeAt);
    for (let i = 0; i < np; i++) {
      const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
      expect(beforeRange[3 * i]!).toBeCloseTo(2 * x, 9);
      expect(beforeRange[3 * i + 1]!).toBeCloseTo(2 * z, 9);
      expect(beforeRange[3 * i + 2]!).toBeCloseTo(2 * y, 9);
    }
    // a hexahedral lattice's wall nodes as well (two-ring fits)
    const h = hexGrid(4, 4, 2), hf = pointFieldFrom(h, 'f', 1, (x, y, z, o) => { o[0] = x * x + 2 * y * z; });
    const g = pointGradientAt(h, hf, Int32Array.of(0, 5, 24));
    for (const [k, i] of [0, 5, 24].entries()) {
      expect(g[3 * k]!).toBeCloseTo(2 * h.points[3 * i]!, 9);
      expect(g[3 * k + 1]!).toBeCloseTo(2 * h.points[3 * i + 2]!, 9);
      expect(g[3 * k + 2]!).toBeCloseTo(2 * h.points[3 * i + 1]!, 9);
    }
  });
});
