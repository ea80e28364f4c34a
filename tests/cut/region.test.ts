/**
 * Regions of a cut: the connected part around a seed, exact rectangle and disk clipping, group ids.
 * References: elementary geometry — rectangle area 4·h1·h2; disk area πR²; a disk cut by a straight edge at
 * distance d from its centre loses the segment R²·acos(d/R) − d·√(R² − d²); ∫ of a linear f over a centrally
 * symmetric region is area × f(centre); ∫x'² over a disk is πR⁴/4 (C).
 */
import { describe, expect, it } from 'vitest';
import { cutPlane } from '../../src/cut/cutPlane.ts';
import { integrateSurface } from '../../src/cut/integrals.ts';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { selectRegion } from '../../src/cut/region.ts';
import { connectedParts } from '../../src/cut/regionConnected.ts';
import { triangleCount } from '../../src/cut/triangleSet.ts';
import { datasetOf, field, hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';

const lin = (x: number, y: number, z: number) => 2 + 0.5 * x - 1.5 * y + 0.25 * z;

function flow(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'phi', 1, (x, y, z, o) => { o[0] = lin(x, y, z); }),
    pointFieldFrom(p, 'velocity', 3, (x, y, _z, o) => { o[0] = 0.1; o[1] = 0; o[2] = 1 + 0.3 * (x - 0.5) - 0.2 * (y - 0.5); }),
  ]);
}

/** Two parallel passages: boxes x ∈ [0, 1] and x ∈ [2, 3], as one piece each (tetrahedra and hexahedra). */
function twoPassages() {
  return datasetOf([flow(tetGrid(3, 3, 3)), flow(hexGrid(3, 3, 3, (u, v, w) => [2 + u, v, w]))]);
}

describe('seed region (connected part)', () => {
  it('a plane across two passages has two parts; the seed picks one', () => {
    const d = twoPassages();
    const cut = cutPlane(d, [0, 0, 0.5], [0, 0, 1]);
    expect(connectedParts(cut).count).toBe(2);
    for (const [x, want] of [[0.5, 0], [2.5, 1]] as const) {
      const r = selectRegion(cut, [{ kind: 'seed', point: [x, 0.4, 0.5] }]);
      expect(r.reason).toBeNull();
      const s = integrateSurface(r.set, { density: 1 });
      expect(s.area).toBeCloseTo(1, 13);
      expect(s.centroid![0]).toBeCloseTo(0.5 + 2 * want, 13);
    }
  });

  it('the seed may lie off the plane (it is projected); a seed off the cut is flagged, not zeroed', () => {
    const d = twoPassages();
    const r = integratePlane(d, { origin: [0, 0, 0.5], normal: [0, 0, 1], region: [{ kind: 'seed', point: [2.5, 0.5, 0.9] }] });
    expect(r.integrals.area).toBeCloseTo(1, 13);
    const off = integratePlane(d, { origin: [0, 0, 0.5], normal: [0, 0, 1], region: [{ kind: 'seed', point: [1.5, 0.5, 0.5] }], integral: { density: 1 } });
    expect(off.integrals.empty).toBe(true);
    expect(off.integrals.reason).toMatch(/off the cut: the nearest cut triangle is 0\.5000 away/);
    expect(off.integrals.area).toBeNull();
    expect(off.integrals.massFlowRate).toBeNull();
  });

  it('parts connect across pieces that duplicate their interface points', () => {
    const pieces = [0, 1].map((k) => hexGrid(2, 4, 4, (u, v, w) => [(k + u) / 2, v, w]));
    const cut = cutPlane(datasetOf(pieces), [0.5, 0.37, 0.5], [0, 1, 0.2]);
    expect(connectedParts(cut).count).toBe(1);
  });
});

describe('rectangle and disk regions (exact clipping)', () => {
  // Sheared in y only, so the cut is the square [0, 1] in x with slanted y-edges away from the shapes.
  const d = datasetOf([flow(tetGrid(5, 4, 3, (u, v, w) => [u, v + 0.1 * u * w - 0.05, w]))]);
  const cut = cutPlane(d, [0.5, 0.5, 0.5], [0, 0, 1]);

  it('a rotated rectangle inside the cut: area 4·h1·h2 and ∫φ = area·φ(centre)', () => {
    const r = selectRegion(cut, [{ kind: 'rectangle', centre: [0.5, 0.45, 0.5], axis: [Math.cos(0.5), Math.sin(0.5), 0.3], half: [0.2, 0.1] }]);
    const s = integrateSurface(r.set, { density: 1 });
    expect(Math.abs(s.area! - 0.08)).toBeLessThan(1e-15);
    expect(Math.abs((s.integral.phi as number) - 0.08 * lin(0.5, 0.45, 0.5))).toBeLessThan(1e-14);
    expect(s.centroid![0]).toBeCloseTo(0.5, 13);
  });

  it('a rectangle reaching past the cut keeps only the overlap', () => {
    const r = selectRegion(cut, [{ kind: 'rectangle', centre: [0.95, 0.5, 0.5], axis: [1, 0, 0], half: [0.1, 0.2] }]);
    expect(integrateSurface(r.set).area).toBeCloseTo(0.15 * 0.4, 14);
  });

  it('a disk inside the cut: area πR² and exact linear and quadratic integrals (arcs included)', () => {
    const R = 0.3, c: [number, number, number] = [0.45, 0.55, 0.5];
    const r = selectRegion(cut, [{ kind: 'disk', centre: c, radius: R }]);
    expect(r.arcs!.weights.length).toBeGreaterThan(0);
    const s = integrateSurface(r.set, { density: 2 }, r.arcs!);
    const A = Math.PI * R * R;
    expect(Math.abs(s.area! / A - 1)).toBeLessThan(1e-13);
    expect(Math.abs((s.integral.phi as number) / (A * lin(...c)) - 1)).toBeLessThan(1e-13);
    // u_z = 1 + 0.3(x − 0.5) − 0.2(y − 0.5) is linear: Q = A·u_z(c); ∫u_z φ adds the second moments πR⁴/4.
    const uc = 1 + 0.3 * (c[0] - 0.5) - 0.2 * (c[1] - 0.5);
    expect(Math.abs(s.volumeFlowRate! / (A * uc) - 1)).toBeLessThan(1e-13);
    const uPhi = A * uc * lin(...c) + (Math.PI * R ** 4 / 4) * (0.3 * 0.5 + -0.2 * -1.5);
    expect(Math.abs((s.massFlowMean.phi as number) / (uPhi / (A * uc)) - 1)).toBeLessThan(1e-13);
  });

  it('a disk crossing the edge of the cut loses exactly the circular segment outside', () => {
    const R = 0.3, dist = 0.1;
    const r = selectRegion(cut, [{ kind: 'disk', centre: [1 - dist, 0.5, 0.5], radius: R }]);
    const s = integrateSurface(r.set, {}, r.arcs!);
    const outside = R * R * Math.acos(dist / R) - dist * Math.sqrt(R * R - dist * dist);
    expect(Math.abs(s.area! / (Math.PI * R * R - outside) - 1)).toBeLessThan(1e-13);
  });

  it('a disk or rectangle that misses the cut gives an empty region with its reason', () => {
    const a = integratePlane(d, { origin: [0.5, 0.5, 0.5], normal: [0, 0, 1], region: [{ kind: 'disk', centre: [3, 3, 0.5], radius: 0.2 }] });
    expect(a.integrals.empty).toBe(true);
    expect(a.integrals.reason).toBe('the disk does not overlap the cut');
    const b = integratePlane(d, { origin: [0.5, 0.5, 0.5], normal: [0, 0, 1], region: [{ kind: 'rectangle', centre: [3, 3, 0.5], axis: [1, 0, 0], half: [0.1, 0.1] }] });
    expect(b.integrals.reason).toBe('the rectangle does not overlap the cut');
  });
});

describe('group region', () => {
  const p = hexGrid(4, 2, 2);
  const zone = new Int32Array(p.cellTypes.length);
  for (let c = 0; c < zone.length; c++) zone[c] = (c % 4) < 2 ? 1 : 2; // x < 0.5 → 1, else 2
  const d = datasetOf([withFields(flow(p), [], [field('zone', 'cell', 1, zone)])]);
  const cut = cutPlane(d, [0.5, 0.5, 0.5], [0, 0, 1]);

  it('keeps the cells whose group id is in the set', () => {
    expect(integrateSurface(selectRegion(cut, [{ kind: 'groups', field: 'zone', ids: [1] }]).set).area).toBeCloseTo(0.5, 14);
    expect(integrateSurface(selectRegion(cut, [{ kind: 'groups', field: 'zone', ids: [2, 1] }]).set).area).toBeCloseTo(1, 14);
    const none = selectRegion(cut, [{ kind: 'groups', field: 'zone', ids: [7] }]);
    expect(triangleCount(none.set)).toBe(0);
    expect(none.reason).toBe('no cut cell has zone in {7}');
  });

  it('names the missing field', () => {
    expect(() => selectRegion(cut, [{ kind: 'groups', field: 'block', ids: [1] }])).toThrow('group region: the cut carries no cell field "block" (cell fields: zone)');
  });

  it('filters combine: group, then seed, then disk', () => {
    const r = selectRegion(cut, [{ kind: 'disk', centre: [0.5, 0.5, 0.5], radius: 0.2 }, { kind: 'groups', field: 'zone', ids: [2] }]);
    const s = integrateSurface(r.set, {}, r.arcs!);
    expect(Math.abs(s.area! - Math.PI * 0.04 / 2)).toBeLessThan(1e-14);
    expect(r.applied[0]).toMatch(/^cells with zone/);
  });
});
