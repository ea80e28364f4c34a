/**
 * Cut geometry reused by mesh (src/cut/cutCache.ts): on datasets sharing a mesh but holding other fields (the
 * steps of a series), `cachedCutPlane` gives bit for bit what a fresh `cutPlane` gives — geometry and the
 * interpolated fields — from the second request on reusing the stored geometry; a dataset on another mesh
 * gets its own cut; and the integrals of a linear flux on a jittered mesh stay exact (a linear field is
 * integrated exactly on any planar triangulation).
 */
import { describe, expect, it } from 'vitest';
import { cachedCutPlane, integratePlaneReusingCut } from '../../src/cut/cutCache.ts';
import { cutPlane } from '../../src/cut/cutPlane.ts';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import type { Vec3 } from '../../src/cut/triangleSet.ts';
import { datasetOf, field } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { Piece } from '../../src/model/piece.ts';
import { boxMesh } from './meshes.ts';

/** The same mesh arrays with a linear velocity (a, 0, 0)·(1 + x + y) and pressure a·z. */
function step(mesh: Piece, a: number): Dataset {
  const n = mesh.points.length / 3, u = new Float64Array(3 * n), p = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const x = mesh.points[3 * i]!, y = mesh.points[3 * i + 1]!, z = mesh.points[3 * i + 2]!;
    u[3 * i] = a * (1 + x + y); p[i] = a * z;
  }
  return datasetOf([{ ...mesh, pointData: [field('velocity', 'point', 3, u), field('p', 'point', 1, p)], cellData: [] }], `step ${a}`);
}

const ORIGIN: Vec3 = [0.43, 0.5, 0.5], NORMAL: Vec3 = [1, 0.1, -0.05];

describe('cut geometry kept with the mesh', () => {
  it('equals a fresh cut bit for bit at every step, fields from the step', () => {
    const mesh = boxMesh('tet', 6, 5, 5, 0.3);
    const shared: object[] = [];
    for (const a of [1, 2, 3, 4]) {
      const d = step(mesh, a);
      const c = cachedCutPlane(d, ORIGIN, NORMAL), f = cutPlane(d, ORIGIN, NORMAL);
      expect(c.positions).toEqual(f.positions);
      expect(c.indices).toEqual(f.indices);
      expect(c.vertexEdges).toEqual(f.vertexEdges);
      expect(c.vertexT).toEqual(f.vertexT);
      expect(c.sourceCell).toEqual(f.sourceCell);
      expect(c.fields.map((x) => x.name)).toEqual(f.fields.map((x) => x.name));
      c.fields.forEach((x, i) => expect(x.values).toEqual(f.fields[i]!.values));
      shared.push(c.positions);
    }
    // stored on the second request, reused from then on
    expect(shared[1]).not.toBe(shared[0]);
    expect(shared[2]).toBe(shared[1]);
    expect(shared[3]).toBe(shared[1]);
  });

  it('cuts another mesh afresh, and a changed plane too', () => {
    const m1 = boxMesh('hex', 4, 4, 4, 0.2), m2 = boxMesh('hex', 5, 4, 4, 0.2);
    for (let i = 0; i < 3; i++) cachedCutPlane(step(m1, 1), ORIGIN, NORMAL);
    const other = cachedCutPlane(step(m2, 1), ORIGIN, NORMAL);
    expect(other.positions).toEqual(cutPlane(step(m2, 1), ORIGIN, NORMAL).positions);
    const moved: Vec3 = [0.61, 0.5, 0.5];
    for (let i = 0; i < 3; i++) expect(cachedCutPlane(step(m1, 1), moved, NORMAL).positions).toEqual(cutPlane(step(m1, 1), moved, NORMAL).positions);
  });

  it('integrates a linear volume flux exactly through a reused cut (and as integratePlane)', () => {
    // u_x = a(1 + x + y) through the plane x = 0.5 of the unit cube: Q = a ∫∫ (1.5 + y) dy dz = 2a
    const mesh = boxMesh('wedge', 5, 6, 4, 0.3);
    for (const a of [1, 2, 3]) {
      const d = step(mesh, a);
      const r = integratePlaneReusingCut(d, { origin: [0.5, 0.5, 0.5], normal: [1, 0, 0], integral: { velocity: 'velocity', pressure: 'p', density: 1 } });
      const fresh = integratePlane(d, { origin: [0.5, 0.5, 0.5], normal: [1, 0, 0], integral: { velocity: 'velocity', pressure: 'p', density: 1 } });
      expect(r.integrals.volumeFlowRate).toBeCloseTo(2 * a, 12);
      expect(r.integrals).toEqual(fresh.integrals);
    }
  });

  it('leaves the pool path (in-plane face keys) to the kernel', () => {
    const d = step(boxMesh('hex', 3, 3, 3), 1);
    const a = cachedCutPlane(d, [0.5, 0.5, 0.5], [0, 0, 1], { planeFaceKeys: true });
    const b = cachedCutPlane(d, [0.5, 0.5, 0.5], [0, 0, 1], { planeFaceKeys: true });
    const c = cachedCutPlane(d, [0.5, 0.5, 0.5], [0, 0, 1], { planeFaceKeys: true });
    expect(a.planeFaces).toBeDefined();
    expect(c.positions).not.toBe(b.positions);
    expect(c.positions).toEqual(a.positions);
  });
});
