/**
 * The software rasteriser of report pictures: projection (the target lands at the picture's centre, the
 * fitted box lies inside the frame), z-buffering (the nearer triangle wins whatever the order drawn),
 * colour mapping through the table, translucency and marks.
 * Reference: pinhole-camera geometry (x_screen = f·x/z) and the painter-independent z-buffer rule.
 */
import { describe, expect, it } from 'vitest';
import { fitCamera, projection, rasterise, type Camera } from '../../src/study/rasterise.ts';

const cam: Camera = { eye: [0, 0, 10], target: [0, 0, 0], up: [0, 1, 0], fovY: 30, width: 64, height: 48 };
const TABLE = new Uint8Array([0, 0, 255, 255, 0, 0]); // blue → red
const pixel = (rgba: Uint8Array, x: number, y: number) => Array.from(rgba.subarray(4 * (y * 64 + x), 4 * (y * 64 + x) + 3));
/** A square of two triangles at height z, side 2s, facing +z, value v at every vertex. */
function square(z: number, s: number, v: number): { positions: number[]; values: number[] } {
  const p = [-s, -s, z, s, -s, z, s, s, z, -s, -s, z, s, s, z, -s, s, z];
  return { positions: p, values: [v, v, v, v, v, v] };
}

describe('rasterise', () => {
  it('projects the target to the centre and keeps fitted box corners in view', () => {
    const p = projection(cam).project(0, 0, 0);
    expect(p.x).toBeCloseTo(32, 12);
    expect(p.y).toBeCloseTo(24, 12);
    expect(p.depth).toBeCloseTo(10, 12);
    // a point at height tan(15°)·10 sits on the top edge (vertical field of view 30°)
    expect(projection(cam).project(0, Math.tan(Math.PI / 12) * 10, 0).y).toBeCloseTo(0, 9);
    const b = [-1, 3, -0.5, 0.5, 0, 10];
    const fit = fitCamera(b, 800, 600), pr = projection(fit);
    for (const x of [b[0]!, b[1]!]) for (const y of [b[2]!, b[3]!]) for (const z of [b[4]!, b[5]!]) {
      const q = pr.project(x, y, z);
      expect(q.x).toBeGreaterThanOrEqual(0); expect(q.x).toBeLessThanOrEqual(800);
      expect(q.y).toBeGreaterThanOrEqual(0); expect(q.y).toBeLessThanOrEqual(600);
    }
  });

  it('the nearer triangle wins whatever the drawing order; values map through the table', () => {
    const near = square(1, 1, 1), far = square(-1, 3, 0);
    for (const order of [[near, far], [far, near]]) {
      const img = rasterise(cam, order.map((s) => ({ positions: s.positions, values: s.values })), [], { colors: TABLE, range: [0, 1], supersample: 1 });
      // facing the camera: full brightness (0.45 + 0.55·|cos 0|) — red in the middle (near, value 1), blue outside it
      expect(pixel(img, 32, 24)).toEqual([255, 0, 0]);
      expect(pixel(img, 32 + 12, 24)).toEqual([0, 0, 255]);
      expect(pixel(img, 0, 0)).toEqual([245, 246, 248]);
    }
  });

  it('a translucent layer blends over the opaque ones without hiding them; marks draw on top', () => {
    const under = square(-1, 3, 0), veil = square(1, 3, 1);
    const img = rasterise(cam, [{ positions: under.positions, values: under.values }, { positions: veil.positions, values: veil.values, opacity: 0.25 }],
      [{ from: [-2, 0, 2], to: [2, 0, 2], color: [0, 255, 0], width: 2 }], { colors: TABLE, range: [0, 1], supersample: 1 });
    // 0.25·red + 0.75·blue
    expect(pixel(img, 20, 10)).toEqual([64, 0, 191]);
    expect(pixel(img, 32, 24)).toEqual([0, 255, 0]);
  });

  it('supersampling averages edge pixels; values outside the range clamp to the table ends', () => {
    const s = square(0, 1.75, 5);
    const img = rasterise(cam, [{ positions: s.positions, values: s.values }], [], { colors: TABLE, range: [0, 1], supersample: 2 });
    expect(pixel(img, 32, 24)).toEqual([255, 0, 0]);
    // some pixel on the square's left edge mixes red and the background
    let mixed = false;
    for (let x = 0; x < 32; x++) { const [r, g] = pixel(img, x, 24); if (r! > 0 && r! < 255 && g! > 0 && g! < 246) mixed = true; }
    expect(mixed).toBe(true);
  });
});
