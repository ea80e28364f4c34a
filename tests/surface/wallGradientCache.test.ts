/**
 * Corner gradients of the second-order wall traction through the mesh's cached plan
 * (src/surface/wallGradientCache.ts) against the uncached kernel (`cornerGradients`): equal to rounding on
 * the Stokes sphere (Stokes 1851; tetrahedra, one piece) and the Hagen–Poiseuille pipe (Hagen 1839,
 * Poiseuille 1840; several pieces), for one velocity and then another on the same mesh arrays (the plan
 * is reused, not rebuilt), and rebuilt when the points change under the same boundary-face object.
 */
import { describe, expect, it } from 'vitest';
import type { Dataset } from '../../src/model/dataset.ts';
import type { FieldArray } from '../../src/model/fieldArray.ts';
import { PIPE_LEVELS, pipeCase } from '../../src/samples/pipe.ts';
import { sphereCase } from '../../src/samples/sphere.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../../src/surface/surfaceCache.ts';
import { facesOfGroups } from '../../src/surface/surfaceGroups.ts';
import { WALL_PLAN_LIMITS, wallCornerGradients, wallPlanAllowance, wallPlanBytes } from '../../src/surface/wallGradientCache.ts';
import { cornerGradients } from '../../src/surface/wallTraction.ts';
import type { BoundaryFaces } from '../../src/surface/boundaryFaces.ts';

function cornerOffsets(faces: BoundaryFaces, selection: Int32Array): Int32Array {
  const o = new Int32Array(selection.length + 1);
  for (let s = 0; s < selection.length; s++) o[s + 1] = o[s]! + faces.offsets[selection[s]! + 1]! - faces.offsets[selection[s]!]!;
  return o;
}

function velocities(d: Dataset): FieldArray[] {
  return d.pieces.map((p) => p.pointData.find((f) => f.components === 3 && /velocity/i.test(f.name))!);
}

/** The dataset with its velocity replaced by u' = (u_x + y·z, u_y − x², 2u_z) on the same mesh arrays. */
function otherVelocity(d: Dataset): Dataset {
  return {
    ...d, pieces: d.pieces.map((p) => {
      const u = p.pointData.find((f) => f.components === 3 && /velocity/i.test(f.name))!, v = new Float64Array(u.values.length);
      for (let i = 0; i < v.length / 3; i++) {
        const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
        v[3 * i] = u.values[3 * i]! + y * z; v[3 * i + 1] = u.values[3 * i + 1]! - x * x; v[3 * i + 2] = 2 * u.values[3 * i + 2]!;
      }
      return { ...p, pointData: [{ ...u, values: v }] };
    }),
  };
}

function gap(a: Float64Array, b: Float64Array): number {
  let scale = 0, g = 0;
  for (let i = 0; i < a.length; i++) { scale = Math.max(scale, Math.abs(b[i]!)); g = Math.max(g, Math.abs(a[i]! - b[i]!)); }
  return g / scale;
}

describe('cached wall-gradient plan', () => {
  for (const [name, make] of [['Stokes sphere', () => sphereCase({ refinement: 1 })], ['pipe (several pieces)', () => pipeCase(PIPE_LEVELS.coarse)]] as const) {
    it(`${name}: equals the kernel to rounding, reused for another velocity on the same mesh`, () => {
      const d = make(), faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
      const selection = facesOfGroups(groups, groups.groups.map((_, i) => i));
      const offsets = cornerOffsets(faces, selection);
      const cached = wallCornerGradients(d, faces, selection, offsets, velocities(d));
      expect(cached.length).toBe(9 * offsets[offsets.length - 1]!);
      expect(gap(cached, cornerGradients(d, faces, selection, offsets, velocities(d)))).toBeLessThan(1e-12);
      const bytes = wallPlanBytes(faces);
      expect(bytes).toBeGreaterThan(0);
      const d2 = otherVelocity(d);
      expect(getBoundaryFaces(d2)).toBe(faces);
      const again = wallCornerGradients(d2, faces, Int32Array.from(selection), offsets, velocities(d2));
      expect(gap(again, cornerGradients(d2, faces, selection, offsets, velocities(d2)))).toBeLessThan(1e-12);
      expect(gap(again, cached)).toBeGreaterThan(1e-3);
      expect(wallPlanBytes(faces)).toBe(bytes);
    });
  }

  it('rebuilds the plan when a piece brings other points, and keeps one per face selection', () => {
    const d = sphereCase({ refinement: 1 }), faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
    const wall = facesOfGroups(groups, [groups.groups.findIndex((g) => g.id === 1)]);
    const offsets = cornerOffsets(faces, wall);
    wallCornerGradients(d, faces, wall, offsets, velocities(d));
    const one = wallPlanBytes(faces);
    // the outer boundary as a second selection: a second plan beside the first
    const outer = facesOfGroups(groups, groups.groups.map((g, i) => (g.id === 1 ? -1 : i)).filter((i) => i >= 0));
    const oo = cornerOffsets(faces, outer);
    expect(gap(wallCornerGradients(d, faces, outer, oo, velocities(d)), cornerGradients(d, faces, outer, oo, velocities(d)))).toBeLessThan(1e-12);
    expect(wallPlanBytes(faces)).toBeGreaterThan(one);
    // the same mesh scaled by 2 (a unit conversion): same faces object passed in, other points → a fresh plan
    const scaled: Dataset = { ...d, pieces: d.pieces.map((p) => ({ ...p, points: p.points.map((x) => 2 * x) })) };
    const g = wallCornerGradients(scaled, faces, wall, offsets, velocities(scaled));
    const k = cornerGradients(scaled, faces, wall, offsets, velocities(scaled));
    expect(gap(g, k)).toBeLessThan(1e-12);
    // gradients halve when lengths double
    expect(gap(g.map((x) => 2 * x), cornerGradients(d, faces, wall, offsets, velocities(d)))).toBeLessThan(1e-12);
  });

  it('leaves a wall whose plan would be too large to the kernel, and sizes the allowance by the mesh', () => {
    expect(wallPlanAllowance(0)).toBe(16 * 1024 * 1024);
    expect(wallPlanAllowance(100e6)).toBe(50e6);
    expect(wallPlanAllowance(1e9)).toBe(64 * 1024 * 1024);
    const saved = { ...WALL_PLAN_LIMITS };
    try {
      WALL_PLAN_LIMITS.minBytes = 1000; WALL_PLAN_LIMITS.maxBytes = 1000;
      const d = sphereCase({ refinement: 1 }), faces = getBoundaryFaces(d), groups = getSurfaceGroups(d);
      const wall = facesOfGroups(groups, [groups.groups.findIndex((g) => g.id === 1)]);
      const offsets = cornerOffsets(faces, wall);
      const g = wallCornerGradients(d, faces, wall, offsets, velocities(d));
      expect(wallPlanBytes(faces)).toBe(0);
      expect(Array.from(g)).toEqual(Array.from(cornerGradients(d, faces, wall, offsets, velocities(d))));
    } finally {
      Object.assign(WALL_PLAN_LIMITS, saved);
    }
  });
});
