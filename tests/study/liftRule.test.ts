/**
 * The lift rule: a mesh thin along one axis (a 2D case extruded along it) gives lift ⟂ drag in the plane of
 * the two largest extents; a 3D case gives the axis most perpendicular to drag, z preferred. Never a
 * silent +z: the rule's sentence says what was done.
 */
import { describe, expect, it } from 'vitest';
import { THIN_FRACTION, deriveLift } from '../../src/study/liftRule.ts';

describe('deriveLift', () => {
  it('a 2D case extruded in z: drag +x gives lift +y, not the spanwise +z', () => {
    const r = deriveLift([1, 0, 0], [-5, 10, -5, 5, 0, 0.1]);
    expect(r.direction).toEqual([0, 1, 0]);
    expect(r.rule).toBe('thin-axis');
    expect(r.text).toBe('lift (0, 1, 0) derived: the mesh is thin along z (a 2D case), so lift is ⟂ drag in the plane of the two largest extents');
  });

  it('a 2D case in the x–z plane (thin in y): drag +x gives lift +z; an inclined drag gives the perpendicular in that plane', () => {
    expect(deriveLift([1, 0, 0], [0, 4, 0, 0.01, -1, 1]).direction).toEqual([0, 0, 1]);
    // drag at 30° in the x–y plane of a z-thin mesh: lift (−sin 30°, cos 30°, 0), largest component positive
    const d = deriveLift([Math.cos(Math.PI / 6), Math.sin(Math.PI / 6), 0], [0, 4, 0, 3, 0, 0.05]).direction;
    expect(d[0]).toBeCloseTo(-0.5, 15);
    expect(d[1]).toBeCloseTo(Math.sqrt(3) / 2, 15);
    expect(d[2]).toBe(0);
  });

  it('a 3D case: lift along z for drag along x or y, along y for drag along z; the rule says to set it otherwise', () => {
    const box: [number, number, number, number, number, number] = [-1, 1, -1, 1, -1, 1];
    expect(deriveLift([1, 0, 0], box)).toMatchObject({ direction: [0, 0, 1], rule: 'up-axis' });
    expect(deriveLift([0, -2, 0], box).direction).toEqual([0, 0, 1]);
    expect(deriveLift([0, 0, 1], box).direction).toEqual([0, 1, 0]);
    expect(deriveLift([1, 0, 0], box).text).toMatch(/^lift \(0, 0, 1\) derived: a 3D case, .*set the lift direction if "up" is another axis$/);
    // a drag with a z part: lift is z with that part removed, unit length, orthogonal to drag
    const d = [3, 0, 4];
    const l = deriveLift(d, box).direction;
    expect(l[0] * d[0] + l[1] * d[1] + l[2] * d[2]).toBeCloseTo(0, 15);
    expect(Math.hypot(...l)).toBeCloseTo(1, 15);
  });

  it('thin means below the stated fraction of the next extent; drag along the thin axis falls back to the 3D rule', () => {
    const just = (f: number): [number, number, number, number, number, number] => [0, 2, 0, 1, 0, f];
    expect(deriveLift([1, 0, 0], just(0.99 * THIN_FRACTION)).rule).toBe('thin-axis');
    expect(deriveLift([1, 0, 0], just(1.01 * THIN_FRACTION)).rule).toBe('up-axis');
    expect(deriveLift([0, 0, 1], [0, 2, 0, 1, 0, 0.01]).rule).toBe('up-axis');
  });

  it('refuses a drag with no direction', () => {
    expect(() => deriveLift([0, 0, 0], [0, 1, 0, 1, 0, 1])).toThrow(/lift rule: the drag direction \(0, 0, 0\) has no direction/);
  });
});
