import { describe, expect, it } from 'vitest';
import { datasetOf, hexGrid } from '../../src/model/meshBuild.ts';
import { boundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { groupOutline } from '../../src/surface/groupOutline.ts';

// Reference: geometry of the unit cube cut into 2×2×2 cells (24 boundary quads of side 1/2, 12 cube edges of length 1).
const cube = datasetOf([hexGrid(2, 2, 2)]);
const faces = boundaryFaces(cube);

/** Total length of the outline segments of group `g` (or of all groups). */
function length(o: { positions: Float32Array; groups: Int32Array }, g?: number): number {
  let s = 0;
  for (let k = 0; k < o.groups.length; k++) {
    if (g !== undefined && o.groups[k] !== g) continue;
    const p = o.positions.subarray(6 * k, 6 * k + 6);
    s += Math.hypot(p[3]! - p[0]!, p[4]! - p[1]!, p[5]! - p[2]!);
  }
  return s;
}

/** The group of each face: the axis of its area vector (0 x, 1 y, 2 z). */
function byAxis(): Int32Array {
  const g = new Int32Array(faces.count);
  for (let f = 0; f < faces.count; f++) {
    const a = [0, 1, 2].map((c) => Math.abs(faces.areaVector[3 * f + c]!));
    g[f] = a.indexOf(Math.max(...a));
  }
  return g;
}

describe('outline of surface groups on a 2×2×2 cube', () => {
  it('has 24 boundary faces', () => expect(faces.count).toBe(24));

  it('a closed surface in one group has no outline', () => {
    const o = groupOutline(cube, faces, new Int32Array(faces.count));
    expect(o.groups.length).toBe(0);
    expect(o.positions.length).toBe(0);
  });

  it('groups by axis: each group is outlined along the 8 cube edges it touches, each edge listed once per side', () => {
    const o = groupOutline(cube, faces, byAxis());
    // each of the 12 cube edges (length 1, two half-edges) borders two groups: 2 × 12 × 2 = 48 segments
    expect(o.groups.length).toBe(48);
    expect(length(o)).toBeCloseTo(24, 12);
    // group x (the faces x = 0 and x = 1) meets y and z groups along the 8 edges of those two squares
    for (let g = 0; g < 3; g++) expect(length(o, g)).toBeCloseTo(8, 12);
  });

  it('segments lie on the cube edges', () => {
    const o = groupOutline(cube, faces, byAxis());
    for (let i = 0; i < o.positions.length; i += 3) {
      const onFaces = [0, 1, 2].filter((c) => o.positions[i + c] === 0 || o.positions[i + c] === 1).length;
      expect(onFaces).toBeGreaterThanOrEqual(2);
    }
  });
});
