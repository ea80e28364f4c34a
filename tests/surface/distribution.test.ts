import { describe, expect, it } from 'vitest';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { sphereCase, sphereExact } from '../../src/samples/sphere.ts';
import { boundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { forceDistribution } from '../../src/surface/distribution.ts';
import { forceTotals } from '../../src/surface/forces.ts';
import { facesOfGroups, surfaceGroups } from '../../src/surface/surfaceGroups.ts';
import { surfaceLoads } from '../../src/surface/surfaceLoads.ts';

describe('force distribution along an axis', () => {
  it('splits one large face exactly across bins: load per length 1 + x on a panel with p = 1 + x', () => {
    // Reference: hand integration: on the unit square, ∫ over a strip x0…x1 of (1 + x) dA / (x1 − x0) = 1 + (x0 + x1)/2.
    const piece = hexGrid(1, 1, 1);
    const d = datasetOf([withFields(piece, [pointFieldFrom(piece, 'p', 1, (x, _y, _z, o) => { o[0] = 1 + x; })])]);
    const faces = boundaryFaces(d), groups = surfaceGroups(d, faces);
    const top = groups.groups.findIndex((g) => Math.abs(g.centroid[2] - 1) < 1e-12);
    const loads = surfaceLoads(d, faces, facesOfGroups(groups, [top]), { viscous: 'none' });
    const r = forceDistribution(d, faces, loads, { axis: [1, 0, 0], bins: 5, dragDirection: [0, 0, 1] });
    expect(r.split).toBe('exact');
    for (let b = 0; b < 5; b++) {
      expect(r.total[3 * b + 2]).toBeCloseTo(1 + (r.edges[b]! + r.edges[b + 1]!) / 2, 13);
      expect(r.dragPerLength[b]).toBeCloseTo(r.total[3 * b + 2]!, 14);
    }
    expect(r.cumulativeDrag[5]).toBeCloseTo(1.5, 13);
    expect(r.viscous).toBeNull();
  });

  it('Stokes sphere: uniform traction gives a constant drag per length 3πμU; the bins sum to the force total', () => {
    // Reference: docs/references.md §3 (the wall traction is uniform, (3μU/2a) e_x) with Archimedes' hat-box
    // theorem (the area of a sphere between two parallel planes is 2πa × their distance): dD/dx = 3πμU.
    const d = sphereCase({ refinement: 2 }), e = sphereExact({ refinement: 2 });
    const faces = boundaryFaces(d), groups = surfaceGroups(d, faces);
    const loads = surfaceLoads(d, faces, facesOfGroups(groups, [0]), {}, groups.faceSurfaceCell);
    const total = forceTotals(d, faces, loads);
    const r = forceDistribution(d, faces, loads, { bins: 8 });
    const want = 3 * Math.PI * e.mu * e.U;
    for (const v of r.dragPerLength) expect(Math.abs(v / want - 1)).toBeLessThan(0.02);
    expect(Math.abs(r.cumulativeDrag[8]! / total.force[0] - 1)).toBeLessThan(1e-12);
    let sx = 0, sp = 0;
    for (let b = 0; b < 8; b++) { const w = r.edges[b + 1]! - r.edges[b]!; sx += r.total[3 * b]! * w; sp += r.pressure[3 * b]! * w; }
    expect(Math.abs(sx / total.force[0] - 1)).toBeLessThan(1e-12);
    expect(Math.abs(sp / total.pressureForce[0] - 1)).toBeLessThan(1e-12);
    for (const v of r.outside) expect(v).toBe(0);
  });

  it('a range narrower than the body puts the rest in `outside`', () => {
    const d = sphereCase({ refinement: 0 }), e = sphereExact();
    const faces = boundaryFaces(d), groups = surfaceGroups(d, faces);
    const loads = surfaceLoads(d, faces, facesOfGroups(groups, [0]), {}, groups.faceSurfaceCell);
    const total = forceTotals(d, faces, loads).force[0];
    const r = forceDistribution(d, faces, loads, { bins: 4, range: [-0.5 * e.a, 0.5 * e.a] });
    expect(Math.abs((r.cumulativeDrag[4]! + r.outside[0]) / total - 1)).toBeLessThan(1e-12);
    expect(r.outside[0]).toBeGreaterThan(0);
    expect(() => forceDistribution(d, faces, loads, { bins: 0 })).toThrow(/bins/);
  });
});
