/**
 * Dataset bounds, computed once per dataset and shared (load report, view, the first cut's tolerance).
 * Reference: the lattice of `hexGrid` maps (u, v, w) ∈ [0, 1]³ through the given map, so an affine map
 * x = 2u − 1, y = 3v, z = 0.5w + 4 has the box [−1, 1] × [0, 3] × [4, 4.5] exactly (by construction).
 */
import { describe, expect, it } from 'vitest';
import { boundsDiagonal, datasetBounds, growBounds } from '../../src/model/bounds.ts';
import { datasetOf, hexGrid, tetGrid } from '../../src/model/meshBuild.ts';

describe('datasetBounds', () => {
  const d = datasetOf([hexGrid(4, 3, 2, (u, v, w) => [2 * u - 1, 3 * v, 0.5 * w + 4]), tetGrid(2, 2, 2, (u, v, w) => [u, v, w + 4])]);

  it('is the box of every point of every piece', () => {
    expect(datasetBounds(d)).toEqual([-1, 1, 0, 3, 4, 5]);
    expect(boundsDiagonal(datasetBounds(d))).toBeCloseTo(Math.hypot(2, 3, 1), 14);
  });

  it('returns a fresh copy each call: changing one answer does not change the next', () => {
    const a = datasetBounds(d);
    a[0] = 99; a[5] = -99;
    expect(datasetBounds(d)).toEqual([-1, 1, 0, 3, 4, 5]);
    expect(datasetBounds(d)).not.toBe(datasetBounds(d));
  });

  it('equals one pass of growBounds over the points, for each dataset on its own', () => {
    const e = datasetOf([hexGrid(3, 3, 3, (u, v, w) => [u + 10, v, w])]);
    expect(datasetBounds(e)).toEqual(growBounds(e.pieces[0]!.points));
    expect(datasetBounds(e)).toEqual([10, 11, 0, 1, 0, 1]);
    expect(datasetBounds(datasetOf([]))[0]).toBe(Infinity);
  });
});
