/**
 * The surface integrals beyond plain exactness: reverse flow, uniformity index, total pressure (kinematic
 * too), point vs cell data, field roles, zero net flow, and boundary surfaces through the same integrator.
 * References: closed-form integrals of piecewise linear profiles over the unit square (C); uniformity index,
 * common practice: γ = 1 − Σ|u_n,i − ū_n|A_i / (2ū_n A); divergence theorem (∮u·n dA = ∫∇·u dV).
 */
import { describe, expect, it } from 'vitest';
import { cutPlane } from '../../src/cut/cutPlane.ts';
import { boundaryTriangleSet } from '../../src/cut/faceSet.ts';
import { guessRole } from '../../src/cut/fieldRoles.ts';
import { integrateSurface } from '../../src/cut/integrals.ts';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { datasetOf, field, hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { boundaryFaces } from '../../src/surface/boundaryFaces.ts';

function withVelocity(p: Piece, fn: (x: number, y: number, z: number) => [number, number, number], name = 'velocity'): Piece {
  return withFields(p, [pointFieldFrom(p, name, 3, (x, y, z, o) => { o.set(fn(x, y, z)); })]);
}

describe('reverse flow and uniformity (exact splits of linear profiles)', () => {
  // u_z = x − 0.3 on the unit square: reverse where x < 0.3.
  const d = datasetOf([withVelocity(tetGrid(4, 3, 3), (x) => [0, 0, x - 0.3])]);
  const r = integratePlane(d, { origin: [0, 0, 0.5], normal: [0, 0, 1], integral: { density: 2 } }).integrals;

  it('reverse-flow area, volume and mass flux are the exact parts with u·n < 0', () => {
    expect(r.reverseFlow!.area).toBeCloseTo(0.3, 14);
    expect(r.reverseFlow!.areaShare).toBeCloseTo(0.3, 14);
    expect(r.reverseFlow!.volumeFlowRate).toBeCloseTo(-0.045, 14);
    expect(r.reverseFlow!.massFlowRate).toBeCloseTo(-0.09, 14);
    // |ṁ| total = ∫2|x − 0.3| = 2(0.045 + 0.245) = 0.58; reverse share 0.09/0.58.
    expect(r.reverseFlow!.massShare).toBeCloseTo(0.09 / 0.58, 14);
  });

  it('uniformity index of u = x − 0.3: γ = 1 − ∫|x − 0.5| / (2·0.2) = 0.375', () => {
    expect(r.uniformityIndex).toBeCloseTo(0.375, 14);
  });

  it('uniform flow has γ = 1 and no reverse flow; flipping the normal flips the fluxes, not the means', () => {
    const u = datasetOf([withVelocity(hexGrid(2, 2, 2), () => [0.3, -0.1, 2])]);
    const a = integratePlane(u, { origin: [0.5, 0.5, 0.5], normal: [0, 0, 1], integral: { density: 1.5 } }).integrals;
    const b = integratePlane(u, { origin: [0.5, 0.5, 0.5], normal: [0, 0, -1], integral: { density: 1.5 } }).integrals;
    expect(a.uniformityIndex).toBeCloseTo(1, 14);
    expect(a.reverseFlow!.area).toBe(0);
    expect(b.reverseFlow!.areaShare).toBeCloseTo(1, 14);
    expect(b.massFlowRate).toBeCloseTo(-a.massFlowRate!, 14);
    expect(b.massFlowMean.velocity).toEqual(a.massFlowMean.velocity);
    expect(a.massFlowRate).toBeCloseTo(3, 14);
  });
});

describe('total pressure', () => {
  // u = (0, 0, 1 + x), p = 10 + y, ρ = 2 on the unit square.
  const base = hexGrid(3, 3, 2);
  const p0 = withFields(withVelocity(base, (x) => [0, 0, 1 + x]), [pointFieldFrom(base, 'p', 1, (_x, y, _z, o) => { o[0] = 10 + y; })]);
  const d = datasetOf([p0]);

  it('p₀ = p + ½ρ|u|²: area and mass-flow means against closed forms', () => {
    const r = integratePlane(d, { origin: [0, 0, 0.5], normal: [0, 0, 1], integral: { density: 2 } }).integrals;
    // Area mean: 10.5 + ∫(1+x)² = 10.5 + 7/3. Mass mean: [∫(1+x)(10+y) + ∫(1+x)³] / ∫(1+x) = (15.75 + 3.75) / 1.5.
    expect(r.totalPressure!.areaMean).toBeCloseTo(10.5 + 7 / 3, 13);
    expect(r.totalPressure!.massFlowMean).toBeCloseTo((1.5 * 10.5 + 3.75) / 1.5, 13);
    expect(r.staticPressure!.massFlowMean).toBeCloseTo(10.5, 13);
  });

  it('kinematic pressure (p/ρ stored): p₀/ρ = p/ρ + ½|u|², reported in that form', () => {
    const r = integratePlane(d, { origin: [0, 0, 0.5], normal: [0, 0, 1], integral: { density: 2, kinematicPressure: true } }).integrals;
    expect(r.totalPressure!.kinematic).toBe(true);
    expect(r.totalPressure!.areaMean).toBeCloseTo(10.5 + 7 / 6, 13);
    // Without a density, the kinematic area mean is still defined; mass-based results are not.
    const k = integratePlane(d, { origin: [0, 0, 0.5], normal: [0, 0, 1], integral: { kinematicPressure: true } }).integrals;
    expect(k.totalPressure!.areaMean).toBeCloseTo(10.5 + 7 / 6, 13);
    expect(k.massFlowRate).toBeNull();
    expect(k.totalPressure!.massFlowMean).toBeNull();
    expect(k.notes.join(' ')).toMatch(/no density/);
  });

  it('a density field equal to the constant gives the same numbers', () => {
    const withRho = datasetOf([withFields(p0, [pointFieldFrom(base, 'rho', 1, (_x, _y, _z, o) => { o[0] = 2; })])]);
    const a = integratePlane(d, { origin: [0, 0, 0.5], normal: [0, 0, 1], integral: { density: 2 } }).integrals;
    const b = integratePlane(withRho, { origin: [0, 0, 0.5], normal: [0, 0, 1] }).integrals;
    expect(b.roles.density).toBe('rho (point)');
    expect(b.massFlowRate).toBeCloseTo(a.massFlowRate!, 14);
    expect(b.totalPressure!.massFlowMean).toBeCloseTo(a.totalPressure!.massFlowMean!, 13);
  });
});

describe('point and cell data, field roles', () => {
  it('cell data is constant over each cell\'s part of the cut', () => {
    const p = hexGrid(4, 1, 1);
    const ux = Float64Array.from({ length: 12 }, (_, c) => (c % 3 === 2 ? (c / 3 < 2 ? -1 : 3) : 0));
    const d = datasetOf([withFields(p, [], [field('U', 'cell', 3, ux)])]);
    const r = integratePlane(d, { origin: [0, 0.5, 0.5], normal: [0, 0, 1], integral: { density: 1 } }).integrals;
    expect(r.roles.velocity).toBe('U (cell)');
    expect(r.volumeFlowRate).toBeCloseTo(0.5 * -1 + 0.5 * 3, 14);
    expect(r.reverseFlow!.area).toBeCloseTo(0.5, 14);
    expect(r.uniformityIndex).toBeCloseTo(1 - 2 / (2 * 1), 14);
  });

  it('a point and a cell field of the same name are both reported, the cell one as "name (cell)"', () => {
    const p = hexGrid(2, 2, 2);
    const d = datasetOf([withFields(p, [pointFieldFrom(p, 'T', 1, (x, _y, _z, o) => { o[0] = x; })], [field('T', 'cell', 1, new Float64Array(8).fill(5))])]);
    const r = integrateSurface(cutPlane(d, [0, 0, 0.5], [0, 0, 1]));
    expect(r.areaMean.T).toBeCloseTo(0.5, 14);
    expect(r.areaMean['T (cell)']).toBeCloseTo(5, 14);
  });

  it('role rule: unique name matches are used, ambiguity is reported and leaves the role unset', () => {
    const f = (name: string, components = 3, association: 'point' | 'cell' = 'point') => ({ name, association, components });
    expect(guessRole([f('U'), f('p', 1)], 'velocity').field?.name).toBe('U');
    expect(guessRole([f('Velocity_mean'), f('vel')], 'velocity').field).toBeNull();
    expect(guessRole([f('velocity', 3, 'cell'), f('velocity')], 'velocity').field?.association).toBe('point');
    expect(guessRole([f('pressure', 1), f('p', 1)], 'pressure').candidates).toEqual(['pressure', 'p']);
    expect(guessRole([f('Density', 1)], 'density').field?.name).toBe('Density');
    expect(() => integrateSurface(cutPlane(datasetOf([hexGrid(1, 1, 1)]), [0, 0, 0.5], [0, 0, 1]), { velocity: 'nope' })).toThrow(/velocity: no field "nope"/);
  });

  it('zero net flow: mass-flow-weighted means are null with a note, not numbers', () => {
    const d = datasetOf([withVelocity(hexGrid(4, 2, 2), (x) => [0, 0, x - 0.5])]);
    const r = integratePlane(d, { origin: [0, 0, 0.5], normal: [0, 0, 1], integral: { density: 1 } }).integrals;
    expect(Math.abs(r.massFlowRate!)).toBeLessThan(1e-15);
    expect(Object.keys(r.massFlowMean)).toHaveLength(0);
    expect(r.notes.join(' ')).toMatch(/mass-flow-weighted means are undefined/);
  });
});

describe('boundary surfaces through the same integrator', () => {
  it('a divergence-free linear velocity has zero net flux through the closed boundary of a box (divergence theorem)', () => {
    const p = withVelocity(tetGrid(3, 3, 3, (u, v, w) => [2 * u + 0.3 * v, v, 1.5 * w]), (x, y, z) => [1 + y - z, 0.5 + z - 2 * x, -0.3 + x + y]);
    const d = datasetOf([p]);
    const faces = boundaryFaces(d);
    const all = Int32Array.from({ length: faces.count }, (_, i) => i);
    const s = integrateSurface(boundaryTriangleSet(d, faces, all), { density: 1 });
    expect(s.area).toBeGreaterThan(0);
    expect(Math.abs(s.massFlowRate!)).toBeLessThan(1e-14);
    expect(s.reverseFlow!.massFlowRate).toBeLessThan(-0.1);
  });
});

describe('many triangles (the integrator works through them in short runs)', () => {
  // Unit cube of 24×24×24 hexahedra cut at z = 0.51: 1152 triangles, many runs of the triangle pass.
  // Reference: closed-form integrals of linear fields over the unit square (C): ∫(1 + x) dA = 1.5,
  // ∫(2 + x − y) dA = 2; every sum is exact for linear data, so only rounding separates the results.
  const p = withFields(hexGrid(24, 24, 24), [
    pointFieldFrom(hexGrid(24, 24, 24), 'velocity', 3, (x, _y, _z, o) => { o[0] = 0; o[1] = 0; o[2] = 1 + x; }),
    pointFieldFrom(hexGrid(24, 24, 24), 'p', 1, (x, y, _z, o) => { o[0] = 2 + x - y; }),
  ]);
  const cut = cutPlane(datasetOf([p]), [0, 0, 0.51], [0, 0, 1]);
  const r = integrateSurface(cut, { density: 3 });

  it('gives the closed-form area, flow rates and integrals', () => {
    expect(cut.indices.length / 3).toBe(1152);
    expect(r.area).toBeCloseTo(1, 13);
    expect(r.volumeFlowRate).toBeCloseTo(1.5, 13);
    expect(r.massFlowRate).toBeCloseTo(4.5, 13);
    expect(r.integral.p as number).toBeCloseTo(2, 13);
    expect(r.areaMean.p as number).toBeCloseTo(2, 13);
  });

  it('matches a plain one-pass sum of the triangles bit for bit (the running sums carry over between runs)', () => {
    const P = cut.positions, I = cut.indices;
    let A = 0;
    for (let t = 0; t < I.length / 3; t++) {
      const a = 3 * I[3 * t]!, b = 3 * I[3 * t + 1]!, c = 3 * I[3 * t + 2]!;
      const ux = P[b]! - P[a]!, uy = P[b + 1]! - P[a + 1]!, uz = P[b + 2]! - P[a + 2]!;
      const wx = P[c]! - P[a]!, wy = P[c + 1]! - P[a + 1]!, wz = P[c + 2]! - P[a + 2]!;
      const nx = uy * wz - uz * wy, ny = uz * wx - ux * wz, nz = ux * wy - uy * wx;
      A += 0.5 * Math.sqrt(nx * nx + ny * ny + nz * nz);
    }
    expect(r.area).toBe(A);
    // Same answer on a second call (scratch state is reset between calls).
    expect(integrateSurface(cut, { density: 3 }).massFlowRate).toBe(r.massFlowRate);
  });
});

describe('magnitudes of 3-vectors (taken from vertex values in the triangle pass)', () => {
  // u = (0.3 + y, −0.2x, 1 + x − z) on oblique cuts of a tetrahedral box; the same components as a 4-component
  // field with a zero fourth component take the general path through the rule's point values: |(u, 0)| = |u| bit for bit.
  const base = tetGrid(4, 3, 5);
  const u = (x: number, y: number, z: number): [number, number, number] => [0.3 + y, -0.2 * x, 1 + x - z];
  const p = withFields(base, [
    pointFieldFrom(base, 'velocity', 3, (x, y, z, o) => { o.set(u(x, y, z)); }),
    pointFieldFrom(base, 'padded', 4, (x, y, z, o) => { o.set([...u(x, y, z), 0]); }),
    pointFieldFrom(base, 'p', 1, (x, y, _z, o) => { o[0] = 5 + x * y; }),
  ]);
  const d = datasetOf([p]);
  for (const density of [undefined, 1.3]) {
    it(`equal the general path's bit for bit (density ${density ?? 'none'}, p₀ ${density ? 'on' : 'off'})`, () => {
      for (const [origin, normal] of [[[0.4, 0.5, 0.5], [1, 0.3, 0.2]], [[0.5, 0.5, 0.61], [-0.2, 0.1, 1]]] as const) {
        const r = integratePlane(d, { origin, normal, integral: density ? { density } : {} }).integrals;
        expect(r.magnitudeAreaMean.velocity).toBe(r.magnitudeAreaMean.padded);
        expect(r.magnitudeMassFlowMean.velocity).toBe(r.magnitudeMassFlowMean.padded);
        expect(r.magnitudeAreaMean.velocity).toBeGreaterThan(0.5);
      }
    });
  }

  it('a linear field of fixed direction has a linear magnitude, integrated exactly: |(3, 4, 0)(1 + x)| mean 7.5 on the unit square (closed form)', () => {
    const q = withFields(hexGrid(3, 3, 2), [pointFieldFrom(hexGrid(3, 3, 2), 'velocity', 3, (x, _y, _z, o) => { o.set([3 * (1 + x), 4 * (1 + x), 0]); })]);
    const r = integratePlane(datasetOf([q]), { origin: [0, 0, 0.5], normal: [0, 0, 1] }).integrals;
    expect(r.magnitudeAreaMean.velocity).toBeCloseTo(7.5, 13);
  });
});
