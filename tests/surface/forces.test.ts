import { describe, expect, it } from 'vitest';
import type { Dataset } from '../../src/model/dataset.ts';
import { datasetOf, field, hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { sphereCase, sphereExact, type SphereOptions } from '../../src/samples/sphere.ts';
import { boundaryFaces, type BoundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { forceDirections, forceTotals, pressureCoefficient, type ForceOptions, type Vec3 } from '../../src/surface/forces.ts';
import { facesOfGroups, resolveGroups, surfaceGroups } from '../../src/surface/surfaceGroups.ts';
import { surfaceLoads, type LoadOptions } from '../../src/surface/surfaceLoads.ts';

/** Force total on the named groups of a dataset. */
function forceOn(d: Dataset, groupRefs: (string | number)[], load: Partial<LoadOptions> = {}, opts: Partial<ForceOptions> = {}) {
  const faces = boundaryFaces(d), groups = surfaceGroups(d, faces);
  const selection = facesOfGroups(groups, resolveGroups(groups, groupRefs));
  const loads = surfaceLoads(d, faces, selection, load, groups.faceSurfaceCell);
  return { faces, groups, selection, loads, result: forceTotals(d, faces, loads, opts) };
}

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('Stokes flow past a sphere: drag 3πμUD = 2πμaU (pressure, 1/3) + 4πμaU (viscous, 2/3)', () => {
  // Reference: docs/references.md §3 (Stokes sphere: wall values and drag split, C), sample src/samples/sphere.ts.
  const levels = [0, 1, 2];
  const run = (association: SphereOptions['association'], load: Partial<LoadOptions>) => levels.map((refinement) => {
    const o = { refinement, association };
    const e = sphereExact(o);
    const r = forceOn(sphereCase(o), [1], load, { reference: { rho: e.rho, speed: e.U, area: e.frontalArea } }).result;
    expect(e.dragTotal).toBeCloseTo(3 * Math.PI * e.mu * e.U * 2 * e.a, 18);
    return {
      total: rel(r.force[0], e.dragTotal), pressure: rel(r.components.pressure.drag, e.dragPressure),
      viscous: rel(r.components.viscous!.drag, e.dragViscous), cd: rel(r.coefficients!.drag, 24 / e.Re),
      lateral: Math.hypot(r.force[1], r.force[2]) / e.dragTotal, method: r.viscous.method,
    };
  });
  const falling = (errs: number[]) => { for (let i = 1; i < errs.length; i++) expect(errs[i]!).toBeLessThan(errs[i - 1]!); };

  it('point data, wall-shear array: errors fall about fourfold per level (second order), < 0.3 % on the finest', () => {
    const e = run('point', {});
    expect(e.every((x) => x.method === 'wall-shear-array')).toBe(true);
    falling(e.map((x) => x.total)); falling(e.map((x) => x.pressure)); falling(e.map((x) => x.viscous));
    expect(e[1]!.total / e[2]!.total).toBeGreaterThan(3);
    expect(e[2]!.total).toBeLessThan(3e-3);
    expect(e[2]!.pressure).toBeLessThan(5e-3);
    expect(e[2]!.viscous).toBeLessThan(3e-3);
    expect(e[2]!.cd).toBeLessThan(3e-3);
    expect(e[2]!.lateral).toBeLessThan(1e-12);
  });

  it('point data, viscous part from the velocity gradient with μ: errors fall (first order), < 6 % on the finest', () => {
    const mu = sphereExact().mu;
    const e = run('point', { viscous: 'gradient', mu });
    expect(e.every((x) => x.method === 'velocity-gradient')).toBe(true);
    falling(e.map((x) => x.viscous)); falling(e.map((x) => x.total));
    expect(e[0]!.viscous / e[2]!.viscous).toBeGreaterThan(3);
    expect(e[2]!.viscous).toBeLessThan(0.06);
    expect(e[2]!.total).toBeLessThan(0.04);
  });

  it('cell data: wall-shear array on the wall triangles, and the gradient from cell velocities, both converge', () => {
    const mu = sphereExact().mu;
    const a = run('cell', {});
    falling(a.map((x) => x.total));
    expect(a[2]!.total).toBeLessThan(3e-3);
    const g = run('cell', { viscous: 'gradient', mu });
    falling(g.map((x) => x.viscous));
    expect(g[2]!.viscous).toBeLessThan(0.12);
  });
});

describe('potential flow past a sphere: zero drag, Cp from 1 to −1.25', () => {
  // Reference: docs/references.md §4 (Katz, Automotive Aerodynamics, Eq. 6.75): Cp = 1 − (9/4)sin²θ, no drag.
  it('drag and lift vanish to rounding; Cp spans 1 … −1.25 at the nodes', () => {
    const o = { flow: 'potential' as const, refinement: 1 };
    const e = sphereExact(o), d = sphereCase(o);
    const { faces, loads, result } = forceOn(d, ['group 1'], {}, { reference: { rho: e.rho, speed: e.U, area: e.frontalArea } });
    expect(Math.abs(result.coefficients!.drag)).toBeLessThan(1e-12);
    expect(Math.abs(result.coefficients!.lift)).toBeLessThan(1e-12);
    expect(Math.abs(result.coefficients!.side)).toBeLessThan(1e-12);
    const cp = pressureCoefficient(d, faces, loads, e.rho, e.U);
    expect(cp.max).toBeCloseTo(1, 10);
    expect(cp.min).toBeCloseTo(-1.25, 10);
    for (const c of cp.perFace) { expect(c).toBeLessThanOrEqual(1); expect(c).toBeGreaterThanOrEqual(-1.25); }
    expect(cp.perCorner.length).toBe(loads.pressure.length);
  });
});

/** Box (0..2)×(0..1)×(0..3) of tetrahedra through a twisting map: planar faces, irregular shape. */
function twistedBox(): Piece {
  return tetGrid(4, 3, 5, (u, v, w) => [2 * u + 0.2 * Math.sin(3 * v) * w, v + 0.1 * u * u, 3 * w + 0.15 * Math.cos(2 * u + v)]);
}

/** Volume and centroid of a tetrahedral piece. */
function volumeCentroid(p: Piece): { V: number; c: Vec3 } {
  let V = 0; const c: Vec3 = [0, 0, 0];
  for (let t = 0; t < p.cellTypes.length; t++) {
    const q = [0, 1, 2, 3].map((k) => 3 * p.connectivity[4 * t + k]!);
    const P = q.map((i) => [p.points[i]!, p.points[i + 1]!, p.points[i + 2]!]);
    const a = [0, 1, 2].map((k) => P[1]![k]! - P[0]![k]!), b = [0, 1, 2].map((k) => P[2]![k]! - P[0]![k]!), e = [0, 1, 2].map((k) => P[3]![k]! - P[0]![k]!);
    const v = (a[0]! * (b[1]! * e[2]! - b[2]! * e[1]!) - a[1]! * (b[0]! * e[2]! - b[2]! * e[0]!) + a[2]! * (b[0]! * e[1]! - b[1]! * e[0]!)) / 6;
    V += v;
    for (let k = 0; k < 3; k++) c[k] += (v * (P[0]![k]! + P[1]![k]! + P[2]![k]! + P[3]![k]!)) / 4;
  }
  return { V, c: [c[0] / V, c[1] / V, c[2] / V] };
}

describe('exact integration of linear pressure (divergence theorem)', () => {
  // Reference: Gauss's divergence theorem: on a closed surface ∮ p n dA = ∫ ∇p dV and ∮ (x − r) × p n dA = V (x̄ − r) × ∇p;
  // both integrands are integrated exactly by the triangle rules, so the match is to rounding.
  it('force V∇p and moment V(x̄ − r)×∇p on a twisted closed body', () => {
    const piece = twistedBox(), g: Vec3 = [1.5, -2, 0.7], r: Vec3 = [0.3, -0.2, 1.1];
    const d = datasetOf([withFields(piece, [pointFieldFrom(piece, 'p', 1, (x, y, z, o) => { o[0] = 4 + g[0] * x + g[1] * y + g[2] * z; })])]);
    const faces = boundaryFaces(d);
    const all = Int32Array.from({ length: faces.count }, (_, i) => i);
    const res = forceTotals(d, faces, surfaceLoads(d, faces, all, { viscous: 'none' }), { momentPoint: r });
    const { V, c } = volumeCentroid(piece);
    const M: Vec3 = [(c[1] - r[1]) * g[2] - (c[2] - r[2]) * g[1], (c[2] - r[2]) * g[0] - (c[0] - r[0]) * g[2], (c[0] - r[0]) * g[1] - (c[1] - r[1]) * g[0]];
    for (let k = 0; k < 3; k++) {
      expect(res.pressureForce[k]).toBeCloseTo(V * g[k]!, 11);
      expect(res.moment[k]).toBeCloseTo(V * M[k]!, 11);
    }
    expect(res.viscousForce).toBeNull();
    expect(res.notes.join(' ')).toMatch(/viscous force not computed/);
  });

  it('buoyancy on a sphere wall: ρgV of the faceted body, upward (Archimedes)', () => {
    // Reference: Archimedes' principle (the force of a hydrostatic field on an immersed body is ρgV upward), exact here.
    const base = sphereCase({ refinement: 1 }), p0 = base.pieces[0]!, rho = 1000, g = 9.81;
    const hydro = pointFieldFrom(p0, 'pressure', 1, (_x, _y, z, o) => { o[0] = 101325 - rho * g * z; });
    const d = datasetOf([{ ...p0, pointData: [hydro] }]);
    const { faces, selection, result } = forceOn(d, [1], { viscous: 'none' });
    // Volume of the faceted sphere: −(1/3) Σ c_f · A_f (wall faces point into the body).
    let V = 0;
    for (const f of selection) for (let k = 0; k < 3; k++) V -= (faces.centroid[3 * f + k]! * faces.areaVector[3 * f + k]!) / 3;
    expect(result.pressureForce[2]).toBeCloseTo(rho * g * V, 9);
    expect(Math.abs(result.pressureForce[0])).toBeLessThan(1e-9);
    expect(rel(V, (4 / 3) * Math.PI * sphereExact().a ** 3)).toBeLessThan(0.03);
  });
});

describe('frame independence', () => {
  // Reference: objectivity of surface integrals: rotating the body, its fields and the moment point rotates F and M.
  it('a rotated body gives rotated forces and moments', () => {
    const base = sphereCase({ refinement: 0 }), p0 = base.pieces[0]!;
    const c = Math.cos(0.7), s = Math.sin(0.7), c2 = Math.cos(-0.4), s2 = Math.sin(-0.4);
    // R = Rz(0.7)·Rx(−0.4)
    const R = [[c, -s * c2, s * s2], [s, c * c2, -c * s2], [0, s2, c2]];
    const rot = (v: ArrayLike<number>, i: number): Vec3 => [0, 1, 2].map((k) => R[k]![0]! * v[i]! + R[k]![1]! * v[i + 1]! + R[k]![2]! * v[i + 2]!) as Vec3;
    const rotArray = (a: Float64Array | ArrayLike<number>) => { const out = new Float64Array(a.length); for (let i = 0; i < a.length; i += 3) out.set(rot(a, i), i); return out; };
    const fieldsOf = (piece: Piece, rotate: boolean) => piece.pointData.map((f) => f.components === 3 && rotate ? field(f.name, 'point', 3, rotArray(f.values)) : f);
    const turned: Piece = { ...p0, points: rotArray(p0.points), pointData: fieldsOf(p0, true) };
    const mp: Vec3 = [0.2e-3, -0.1e-3, 0.3e-3];
    const mu = sphereExact().mu;
    for (const load of [{}, { viscous: 'gradient' as const, mu }]) {
      const a = forceOn(base, [1], load, { momentPoint: mp }).result;
      const b = forceOn(datasetOf([turned]), [1], load, { momentPoint: rot(mp, 0) }).result;
      const fa = rot(a.force, 0), ma = rot(a.moment, 0);
      const fs = Math.hypot(...a.force), ms = Math.hypot(...a.moment);
      for (let k = 0; k < 3; k++) {
        expect(Math.abs(b.force[k] - fa[k]!) / fs).toBeLessThan(1e-12);
        expect(Math.abs(b.moment[k] - ma[k]!) / ms).toBeLessThan(1e-9);
      }
    }
  });
});

describe('moments, centre of pressure, coefficients and options', () => {
  /** Box [0,1]³ of hexahedra with p = 1 + x; its top face (z = 1) is one feature-angle group. */
  function topFace(): { d: Dataset; faces: BoundaryFaces; top: number } {
    const piece = hexGrid(4, 4, 4);
    const d = datasetOf([withFields(piece, [pointFieldFrom(piece, 'p', 1, (x, _y, _z, o) => { o[0] = 1 + x; })])]);
    const faces = boundaryFaces(d), groups = surfaceGroups(d, faces);
    const top = groups.groups.find((g) => Math.abs(g.centroid[2] - 1) < 1e-12)!.id;
    return { d, faces, top };
  }

  it('flat panel with linear load: force, moment and centre of pressure as integrated by hand', () => {
    // Reference: hand integration over the unit square: ∫(1+x) = 3/2, ∫y(1+x) = 3/4, ∫x(1+x) = 5/6; x_cp = (5/6)/(3/2).
    const { d, top } = topFace();
    const r = forceOn(d, [top], { viscous: 'none' }, { momentPoint: [0, 0, 0], cpAxis: [1, 0, 0] }).result;
    // Faces point out of the fluid (+z on top): the force on what lies beyond the top face is +z.
    expect(r.pressureForce[2]).toBeCloseTo(1.5, 13);
    expect(r.moment[0]).toBeCloseTo(0.75, 13);
    expect(r.moment[1]).toBeCloseTo(-5 / 6, 13);
    expect(r.centreOfPressure!.offset).toBeCloseTo(5 / 9, 13);
    expect(r.centreOfPressure!.position[0]).toBeCloseTo(5 / 9, 13);
    // nothing cancels on a flat panel loaded one way: Σ|dF| is the force itself
    expect(r.grossForce).toBeCloseTo(1.5, 13);
  });

  it('coefficients on ½ρU²A (and L for moments) along drag, lift and side = lift × drag', () => {
    const { d, top } = topFace();
    const ref = { rho: 2, speed: 3, area: 0.5, length: 2 };
    const r = forceOn(d, [top], { viscous: 'none' }, { dragDirection: [0, 0, 2], liftDirection: [1, 0, 0], reference: ref }).result;
    const qa = 0.5 * 2 * 9 * 0.5;
    // side = lift × drag = x × z = −y, so (drag, side, lift) = (z, −y, x) is right-handed.
    expect(r.directions.drag).toEqual([0, 0, 1]);
    expect(r.directions.side).toEqual([0, -1, 0]);
    expect(r.coefficients!.drag).toBeCloseTo(1.5 / qa, 13);
    expect(r.coefficients!.pressure.drag).toBeCloseTo(1.5 / qa, 13);
    expect(r.coefficients!.viscous).toBeNull();
    expect(r.coefficients!.lift).toBeCloseTo(0, 13);
    expect(r.coefficients!.moment!.aboutSide).toBeCloseTo(5 / 6 / qa / 2, 13);
    expect(r.coefficients!.moment!.aboutLift).toBeCloseTo(0.75 / qa / 2, 13);
    expect(r.coefficients!.moment!.aboutDrag).toBeCloseTo(0, 13);
    expect(r.signConvention).toMatch(/fluid on the wall/);
    expect(r.units).toMatch(/N·m/);
  });

  it('lift is made orthogonal to drag (with a note); parallel or zero directions are refused', () => {
    const dirs = forceDirections([1, 0, 0], [0.1, 0, 1]);
    expect(dirs.lift[0]).toBe(0);
    expect(dirs.lift[2]).toBe(1);
    expect(dirs.adjusted).toBe(true);
    expect(() => forceDirections([1, 0, 0], [2, 0, 0])).toThrow(/parallel/);
    expect(() => forceDirections([0, 0, 0], [0, 0, 1])).toThrow(/non-zero/);
  });

  it('kinematic pressure (p/ρ stored) times ρ gives the same force; no ρ is an error', () => {
    const { d, top } = topFace();
    const p0 = d.pieces[0]!, kin = datasetOf([{ ...p0, pointData: [field('p', 'point', 1, Float64Array.from(p0.pointData[0]!.values, (v) => v / 998))] }]);
    const a = forceOn(d, [top], { viscous: 'none' }).result;
    const b = forceOn(kin, [top], { viscous: 'none', kinematic: true, rho: 998 }).result;
    expect(b.pressureForce[2]).toBeCloseTo(a.pressureForce[2], 12);
    expect(b.notes.join(' ')).toMatch(/kinematic/);
    expect(() => forceOn(kin, [top], { kinematic: true })).toThrow(/needs the density/);
  });

  it('p_ref is subtracted; a closed surface under uniform pressure feels no force', () => {
    const { d } = topFace();
    const faces = boundaryFaces(d);
    const all = Int32Array.from({ length: faces.count }, (_, i) => i);
    const uniform = datasetOf([{ ...d.pieces[0]!, pointData: [field('p', 'point', 1, new Float64Array(125).fill(7))] }]);
    const r = forceTotals(uniform, faces, surfaceLoads(uniform, faces, all, { viscous: 'none' }));
    for (const v of r.force) expect(Math.abs(v)).toBeLessThan(1e-13);
    // Σ|dF| = 7 Pa × area 6 of the unit cube: every component is rounding noise beside it (≤ 10⁻⁹ of it)
    expect(r.grossForce).toBeCloseTo(42, 12);
    for (const v of r.force) expect(Math.abs(v)).toBeLessThanOrEqual(1e-9 * r.grossForce);
    const top = forceOn(uniform, [resolveTop(uniform)], { viscous: 'none', pRef: 7 }).result;
    expect(top.pressureForce[2]).toBe(0);
  });

  it('wall-shear sign option flips the viscous part; missing pressure is a clear error', () => {
    const d = sphereCase({ refinement: 0 });
    const a = forceOn(d, [1]).result, b = forceOn(d, [1], { wallShearSign: -1 }).result;
    expect(b.viscousForce![0]).toBeCloseTo(-a.viscousForce![0], 18);
    expect(b.pressureForce[0]).toBe(a.pressureForce[0]);
    expect(() => forceOn(d, [1], { pressure: 'nope' })).toThrow(/no pressure array "nope"; arrays: velocity \(point, 3\)/);
  });
});

function resolveTop(d: Dataset): number {
  const faces = boundaryFaces(d), groups = surfaceGroups(d, faces);
  return groups.groups.find((g) => Math.abs(g.centroid[2] - 1) < 1e-12)!.id;
}

describe('force totals over many faces', () => {
  // Reference: exactness of the sum's order. Every boundary face of a tetrahedral mesh is one triangle, so the
  // total over all faces is the per-face totals added in face order; the integration (in calls of a few dozen
  // faces carrying running sums) must give those very bits, for the pressure and viscous force, both moments
  // and the wetted area.
  it('equal, bit for bit, the per-face totals added in order (pressure, traction, moments, area)', () => {
    const p = tetGrid(7, 6, 5, (u, v, w) => [u + 0.1 * v * w, v + 0.05 * u, w * (1 + 0.2 * u)]);
    const d = datasetOf([withFields(p, [
      pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 3 + x * y - 2 * z * z; }),
      pointFieldFrom(p, 'wss', 3, (x, y, z, o) => { o[0] = y; o[1] = x * z; o[2] = 0.5 - x; }),
    ])]);
    const faces = boundaryFaces(d);
    expect(faces.count).toBeGreaterThan(400);
    const all = Int32Array.from({ length: faces.count }, (_, i) => i);
    const opts = { momentPoint: [0.3, -0.2, 0.1] as Vec3 };
    const total = forceTotals(d, faces, surfaceLoads(d, faces, all, { pressure: 'p', wallShear: 'wss' }), opts);
    const sum = { fp: [0, 0, 0], fv: [0, 0, 0], mp: [0, 0, 0], mv: [0, 0, 0], area: 0 };
    for (let f = 0; f < faces.count; f++) {
      const one = forceTotals(d, faces, surfaceLoads(d, faces, Int32Array.of(f), { pressure: 'p', wallShear: 'wss' }), opts);
      for (let a = 0; a < 3; a++) {
        sum.fp[a] += one.pressureForce[a]; sum.fv[a] += one.viscousForce![a]; sum.mp[a] += one.pressureMoment[a]; sum.mv[a] += one.viscousMoment![a];
      }
      sum.area += one.area;
    }
    expect(total.pressureForce).toEqual(sum.fp);
    expect(total.viscousForce).toEqual(sum.fv);
    expect(total.pressureMoment).toEqual(sum.mp);
    expect(total.viscousMoment).toEqual(sum.mv);
    expect(total.area).toBe(sum.area);
  });
});
