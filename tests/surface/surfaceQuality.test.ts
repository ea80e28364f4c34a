import { describe, expect, it } from 'vitest';
import { datasetOf, hexGrid, tetGrid } from '../../src/model/meshBuild.ts';
import { boundaryFaces, type BoundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { surfaceQuality } from '../../src/surface/surfaceQuality.ts';

const all = (b: BoundaryFaces) => Int32Array.from({ length: b.count }, (_, i) => i);

describe('surface quality figures', () => {
  // Reference: unit cube (area 6) and the divergence theorem (∮ n dA = 0 on a closed surface).
  it('a closed cube: wetted area 6, |∮ n dA| / area at rounding level, every edge used twice in opposite directions', () => {
    for (const piece of [hexGrid(3, 2, 4), tetGrid(2, 3, 2)]) {
      const b = boundaryFaces(datasetOf([piece]));
      const q = surfaceQuality(b);
      expect(q.area).toBeCloseTo(6, 13);
      expect(q.closure).toBeLessThan(1e-15);
      expect(q.closed).toBe(true);
      expect(q.consistentlyOriented).toBe(true);
      expect(q.openEdges + q.nonManifoldEdges + q.inconsistentEdges).toBe(0);
      // Euler: V − E + F = 2 for the closed surface.
      expect(new Set(b.points).size - q.edges + q.faces).toBe(2);
    }
  });

  it('an open surface is reported with its open edges, and ∮ n dA no longer vanishes', () => {
    const b = boundaryFaces(datasetOf([hexGrid(2, 2, 2)]));
    // Drop the four faces of the z = 1 side.
    const keep = Int32Array.from(Array.from(all(b)).filter((f) => b.centroid[3 * f + 2]! < 1 - 1e-12));
    const q = surfaceQuality(b, keep);
    expect(q.faces).toBe(20);
    expect(q.openEdges).toBe(8);
    expect(q.closed).toBe(false);
    expect(q.netAreaVector[2]).toBeCloseTo(-1, 14);
    expect(q.closure).toBeCloseTo(1 / 5, 14);
  });

  it('an inconsistently oriented surface is reported (edges traversed twice in the same direction)', () => {
    const b = boundaryFaces(datasetOf([hexGrid(1, 1, 1)]));
    // Reverse face 0 in the merged numbering, as a writer with a wrongly wound face would give.
    const points = Int32Array.from(b.points);
    const s = b.offsets[0]!, e = b.offsets[1]!;
    points.set(Array.from(points.subarray(s, e)).reverse(), s);
    const q = surfaceQuality({ ...b, points });
    expect(q.inconsistentEdges).toBe(4);
    expect(q.consistentlyOriented).toBe(false);
    expect(q.closed).toBe(false);
  });

  it('an empty selection gives NaN closure, not a silent zero', () => {
    const b = boundaryFaces(datasetOf([hexGrid(1, 1, 1)]));
    const q = surfaceQuality(b, new Int32Array(0));
    expect(q.faces).toBe(0);
    expect(q.closure).toBeNaN();
    expect(q.closed).toBe(false);
  });
});
