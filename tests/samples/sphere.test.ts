/**
 * The sphere samples: the exact flows and the shell mesh.
 * Reference: docs/references.md §3 (Stokes sphere: velocity and pressure M, Stokes 1851 / Bird–Stewart–
 * Lightfoot §2.6; checked here as its C entry says — divergence-free, satisfies the Stokes equations, no slip;
 * wall values and the drag split 2πμaU + 4πμaU, C_D = 24/Re are C) and §4 (potential sphere: Cp = 1 − (9/4)sin²θ,
 * zero drag; V, Katz 2016 Eq. 6.75). Geometry: the volume of a spherical shell, 4π(R_o³ − a³)/3.
 */
import { describe, expect, it } from 'vitest';
import { findField, type Piece } from '../../src/model/piece.ts';
import { cellCentroids, cellVolumes } from '../../src/samples/cellMeasures.ts';
import { signedVolume6 } from '../../src/samples/shellMesh.ts';
import {
  SPHERE_GROUPS, sphereCase, sphereExact, sphereOptions, spherePressure, sphereVelocity, sphereWallCp, sphereWallShear,
  type SphereOptions,
} from '../../src/samples/sphere.ts';

function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => { s = (Math.imul(s, 1664525) + 1013904223) >>> 0; return s / 2 ** 32; };
}

/** Random points in the shell a·1.05 < r < 4a. */
function shellPoints(a: number, n: number, seed: number): [number, number, number][] {
  const rand = rng(seed), out: [number, number, number][] = [];
  while (out.length < n) {
    const p: [number, number, number] = [(2 * rand() - 1) * 4 * a, (2 * rand() - 1) * 4 * a, (2 * rand() - 1) * 4 * a];
    const r = Math.hypot(...p);
    if (r > 1.05 * a && r < 4 * a) out.push(p);
  }
  return out;
}

/** Velocity gradient ∂u_i/∂x_j and Laplacian of u by 4th-order central differences with step h. */
function derivatives(f: SphereOptions, x: number, y: number, z: number, h: number): { grad: number[][]; lap: number[] } {
  const u = (p: number[]) => { const o = new Float64Array(3); sphereVelocity(f, p[0]!, p[1]!, p[2]!, o); return o; };
  const c = [x, y, z], u0 = u(c);
  const grad = [[0, 0, 0], [0, 0, 0], [0, 0, 0]], lap = [0, 0, 0];
  for (let j = 0; j < 3; j++) {
    const at = (s: number) => { const p = [...c]; p[j]! += s; return u(p); };
    const p1 = at(h), m1 = at(-h), p2 = at(2 * h), m2 = at(-2 * h);
    for (let i = 0; i < 3; i++) {
      grad[i]![j] = (-p2[i]! + 8 * p1[i]! - 8 * m1[i]! + m2[i]!) / (12 * h);
      lap[i]! += (-p2[i]! + 16 * p1[i]! - 30 * u0[i]! + 16 * m1[i]! - m2[i]!) / (12 * h * h);
    }
  }
  return { grad, lap };
}

/** Pressure gradient by 4th-order central differences. */
function pressureGradient(f: SphereOptions, x: number, y: number, z: number, h: number): number[] {
  const c = [x, y, z];
  return [0, 1, 2].map((j) => {
    const at = (s: number) => { const p = [...c]; p[j]! += s; return spherePressure(f, p[0]!, p[1]!, p[2]!); };
    return (-at(2 * h) + 8 * at(h) - 8 * at(-h) + at(-2 * h)) / (12 * h);
  });
}

/** Faces used by the tetrahedra: sorted node triple → use count. */
function tetFaceUse(p: Piece): Map<string, number> {
  const use = new Map<string, number>();
  for (let c = 0; c < p.cellTypes.length; c++) {
    if (p.cellTypes[c] !== 10) continue;
    const o = p.offsets[c]!, q = [0, 1, 2, 3].map((k) => p.connectivity[o + k]!);
    for (const f of [[0, 1, 2], [0, 1, 3], [0, 2, 3], [1, 2, 3]]) {
      const key = f.map((k) => q[k]!).sort((s, t) => s - t).join(',');
      use.set(key, (use.get(key) ?? 0) + 1);
    }
  }
  return use;
}

/** Area-weighted normal (m²) of triangle (a, b, c), by the right-hand rule. */
function triangleNormal(P: Float64Array, a: number, b: number, c: number): [number, number, number] {
  const u = [P[3 * b]! - P[3 * a]!, P[3 * b + 1]! - P[3 * a + 1]!, P[3 * b + 2]! - P[3 * a + 2]!];
  const v = [P[3 * c]! - P[3 * a]!, P[3 * c + 1]! - P[3 * a + 1]!, P[3 * c + 2]! - P[3 * a + 2]!];
  return [(u[1]! * v[2]! - u[2]! * v[1]!) / 2, (u[2]! * v[0]! - u[0]! * v[2]!) / 2, (u[0]! * v[1]! - u[1]! * v[0]!) / 2];
}

const stokes = sphereOptions({ flow: 'stokes' });
const potential = sphereOptions({ flow: 'potential' });

describe('Stokes flow past a sphere (docs/references.md §3)', () => {
  it('is divergence-free and satisfies μ∇²u = ∇p at random points (finite differences)', () => {
    const a = stokes.radius, h = 1e-3 * a, U = stokes.speed;
    for (const [x, y, z] of shellPoints(a, 60, 3)) {
      const { grad, lap } = derivatives(stokes, x, y, z, h);
      const gp = pressureGradient(stokes, x, y, z, h);
      const scaleDiv = U / a, scaleMom = (stokes.mu * U) / (a * a);
      expect(Math.abs(grad[0]![0]! + grad[1]![1]! + grad[2]![2]!) / scaleDiv).toBeLessThan(1e-9);
      for (let i = 0; i < 3; i++) expect(Math.abs(stokes.mu * lap[i]! - gp[i]!) / scaleMom).toBeLessThan(1e-6);
    }
  });

  it('has no slip on the sphere and tends to the free stream far away', () => {
    const a = stokes.radius, U = stokes.speed, out = new Float64Array(3), rand = rng(5);
    for (let k = 0; k < 100; k++) {
      const t = Math.acos(2 * rand() - 1), f = 2 * Math.PI * rand();
      sphereVelocity(stokes, a * Math.sin(t) * Math.cos(f), a * Math.sin(t) * Math.sin(f), a * Math.cos(t), out);
      expect(Math.hypot(...out) / U).toBeLessThan(1e-15);
    }
    sphereVelocity(stokes, 0, 1e6 * a, 0, out);
    expect(out[0]! / U).toBeCloseTo(1 - 0.75e-6, 9);
  });

  it('wall values: p = −(3μU/2a)cos θ, |τ_w| = (3μU/2a)sin θ, Cp = −(6/Re)cos θ', () => {
    const a = stokes.radius, U = stokes.speed, mu = stokes.mu, e = sphereExact(stokes), out = new Float64Array(3);
    for (const t of [0, 0.4, 1.2, Math.PI / 2, 2.5, Math.PI]) {
      const x = a * Math.cos(t), y = a * Math.sin(t);
      expect(spherePressure(stokes, x, y, 0)).toBeCloseTo((-1.5 * mu * U / a) * Math.cos(t), 14);
      sphereWallShear(stokes, x, y, 0, out);
      expect(Math.hypot(...out)).toBeCloseTo((1.5 * mu * U / a) * Math.sin(t), 14);
      expect(out[0]! * x + out[1]! * y).toBeCloseTo(0, 18);
      expect(sphereWallCp(stokes, t)).toBeCloseTo((-6 / e.Re) * Math.cos(t), 9);
    }
  });

  it('drag 6πμaU = 2πμaU (pressure) + 4πμaU (viscous), C_D = 24/Re', () => {
    const e = sphereExact(stokes);
    const a = stokes.radius, U = stokes.speed, mu = stokes.mu;
    expect(e.dragPressure).toBeCloseTo(2 * Math.PI * mu * a * U, 20);
    expect(e.dragViscous).toBeCloseTo(4 * Math.PI * mu * a * U, 20);
    expect(e.dragTotal / (3 * Math.PI * mu * U * 2 * a)).toBeCloseTo(1, 14);
    expect(e.CD * e.Re).toBeCloseTo(24, 10);
    expect(e.CDPressure / e.CD).toBeCloseTo(1 / 3, 14);
  });

  it('the exact wall values on the mesh integrate to the drag parts, converging at second order', () => {
    const e = sphereExact(stokes), res: { p: number; v: number; lift: number }[] = [];
    for (const refinement of [0, 1, 2]) {
      const d = sphereCase({ flow: 'stokes', refinement }), p = d.pieces[0]!;
      const pr = findField(p, 'p', 'point')!.values, tau = findField(p, 'skinFriction', 'point')!.values;
      const group = findField(p, 'group', 'cell')!.values;
      let fp = 0, fv = 0, lift = 0;
      for (let c = 0; c < p.cellTypes.length; c++) {
        if (group[c] !== SPHERE_GROUPS.wall) continue;
        const o = p.offsets[c]!, q = [0, 1, 2].map((k) => p.connectivity[o + k]!);
        const n = triangleNormal(p.points, q[0]!, q[1]!, q[2]!), area = Math.hypot(...n);
        const pm = (pr[q[0]!]! + pr[q[1]!]! + pr[q[2]!]!) / 3;
        // The wall triangles face into the sphere, so the fluid pushes on the sphere with p·n.
        fp += pm * n[0];
        lift += pm * n[1];
        fv += area * (tau[3 * q[0]!]! + tau[3 * q[1]!]! + tau[3 * q[2]!]!) / 3;
      }
      res.push({ p: fp, v: fv, lift });
    }
    const ep = res.map((r) => r.p - e.dragPressure), ev = res.map((r) => r.v - e.dragViscous);
    expect(Math.log(Math.abs(ep[1]! / ep[2]!)) / Math.log(2)).toBeCloseTo(2, 0);
    expect(Math.log(Math.abs(ev[1]! / ev[2]!)) / Math.log(2)).toBeCloseTo(2, 0);
    expect(Math.abs(ep[2]! / e.dragPressure)).toBeLessThan(0.01);
    expect(Math.abs(ev[2]! / e.dragViscous)).toBeLessThan(0.01);
    for (const r of res) expect(Math.abs(r.lift) / e.dragTotal).toBeLessThan(1e-12);
  });
});

describe('potential flow past a sphere (docs/references.md §4)', () => {
  it('is divergence-free and irrotational at random points, with u·n = 0 on the wall', () => {
    const a = potential.radius, U = potential.speed;
    for (const [x, y, z] of shellPoints(a, 60, 9)) {
      const { grad } = derivatives(potential, x, y, z, 1e-3 * a);
      expect(Math.abs(grad[0]![0]! + grad[1]![1]! + grad[2]![2]!) / (U / a)).toBeLessThan(1e-9);
      expect(Math.abs(grad[2]![1]! - grad[1]![2]!) / (U / a)).toBeLessThan(1e-9);
      expect(Math.abs(grad[0]![2]! - grad[2]![0]!) / (U / a)).toBeLessThan(1e-9);
      expect(Math.abs(grad[1]![0]! - grad[0]![1]!) / (U / a)).toBeLessThan(1e-9);
    }
    const out = new Float64Array(3);
    for (const t of [0.1, 1, 2, 3]) {
      sphereVelocity(potential, a * Math.cos(t), 0, a * Math.sin(t), out);
      expect((out[0]! * Math.cos(t) + out[2]! * Math.sin(t)) / U).toBeCloseTo(0, 14);
      expect(Math.hypot(...out) / U).toBeCloseTo(1.5 * Math.sin(t), 14);
    }
  });

  it('the wall pressure field of the sample gives Cp = 1 − (9/4)sin²θ at every wall node (Katz 2016, Eq. 6.75)', () => {
    const d = sphereCase({ flow: 'potential', refinement: 1 }), p = d.pieces[0]!, e = sphereExact(potential);
    const pr = findField(p, 'p', 'point')!.values, a = potential.radius, nWall = 10 * 36 + 2;
    for (let i = 0; i < nWall; i++) {
      const x = p.points[3 * i]!, r = Math.hypot(x, p.points[3 * i + 1]!, p.points[3 * i + 2]!);
      expect(r / a).toBeCloseTo(1, 15);
      const sin2 = 1 - (x / r) ** 2;
      expect(pr[i]! / e.dynamicPressure).toBeCloseTo(1 - 2.25 * sin2, 12);
    }
    expect(e.cpStagnation).toBe(1);
    expect(e.cpMin).toBe(-1.25);
    expect(e.dragTotal).toBe(0);
    expect(Math.max(...findField(p, 'skinFriction', 'point')!.values.map(Math.abs))).toBe(0);
  });
});

describe('sphere shell mesh', () => {
  it('is conforming: faces used by one tetrahedron lie on the two spheres and match the triangle cells one to one', () => {
    for (const refinement of [0, 1]) {
      const d = sphereCase({ refinement }), p = d.pieces[0]!, o = sphereOptions({ refinement });
      const use = tetFaceUse(p), a = o.radius, R = o.outerRadius;
      let once = 0;
      const boundary = new Set<string>();
      for (const [key, n] of use) {
        expect(n).toBeLessThanOrEqual(2);
        if (n !== 1) continue;
        once++;
        boundary.add(key);
        const rs = key.split(',').map((s) => { const i = 3 * Number(s); return Math.hypot(p.points[i]!, p.points[i + 1]!, p.points[i + 2]!); });
        const onInner = rs.every((r) => Math.abs(r - a) < 1e-15 * a), onOuter = rs.every((r) => Math.abs(r - R) < 1e-15 * R);
        expect(onInner || onOuter).toBe(true);
      }
      // A closed geodesic sphere has 20n² triangles; both boundary spheres together 40n².
      expect(once).toBe(40 * o.divisions ** 2);
      const tri: string[] = [];
      for (let c = 0; c < p.cellTypes.length; c++) {
        if (p.cellTypes[c] !== 5) continue;
        const q = p.offsets[c]!;
        tri.push([0, 1, 2].map((k) => p.connectivity[q + k]!).sort((s, t) => s - t).join(','));
      }
      expect(tri.length).toBe(once);
      expect(new Set(tri).size).toBe(once);
      for (const t of tri) expect(boundary.has(t)).toBe(true);
    }
  });

  it('every tetrahedron is positive; volume converges to 4π(R_o³ − a³)/3 at second order', () => {
    const errs: number[] = [];
    for (const refinement of [0, 1, 2]) {
      const d = sphereCase({ refinement }), p = d.pieces[0]!, e = sphereExact({ refinement });
      let vol = 0, min = Infinity;
      for (let c = 0; c < p.cellTypes.length; c++) {
        if (p.cellTypes[c] !== 10) continue;
        const o = p.offsets[c]!, v = signedVolume6(p.points, p.connectivity[o]!, p.connectivity[o + 1]!, p.connectivity[o + 2]!, p.connectivity[o + 3]!) / 6;
        min = Math.min(min, v);
        vol += v;
      }
      expect(min).toBeGreaterThan(0);
      expect(vol).toBeCloseTo(cellVolumes(p).reduce((s, x) => s + x, 0), 20);
      errs.push(vol - e.shellVolume);
    }
    expect(Math.log(errs[0]! / errs[1]!) / Math.log(2)).toBeCloseTo(2, 0);
    expect(Math.log(errs[1]! / errs[2]!) / Math.log(2)).toBeCloseTo(2, 0);
  });

  it('tetrahedra have sensible shape: longest edge within 3.5× the shortest in every cell', () => {
    const p = sphereCase({ refinement: 1 }).pieces[0]!, P = p.points;
    let worst = 0;
    for (let c = 0; c < p.cellTypes.length; c++) {
      if (p.cellTypes[c] !== 10) continue;
      const o = p.offsets[c]!, q = [0, 1, 2, 3].map((k) => 3 * p.connectivity[o + k]!);
      const lens: number[] = [];
      for (let i = 0; i < 4; i++) for (let j = i + 1; j < 4; j++) lens.push(Math.hypot(P[q[i]!]! - P[q[j]!]!, P[q[i]! + 1]! - P[q[j]! + 1]!, P[q[i]! + 2]! - P[q[j]! + 2]!));
      worst = Math.max(worst, Math.max(...lens) / Math.min(...lens));
    }
    expect(worst).toBeLessThan(3.5);
  });

  it('boundary triangles face out of the fluid: into the sphere on the wall, outward on the outer sphere', () => {
    const p = sphereCase({ refinement: 0 }).pieces[0]!, group = findField(p, 'group', 'cell')!.values;
    let wall = 0, outer = 0;
    for (let c = 0; c < p.cellTypes.length; c++) {
      if (p.cellTypes[c] !== 5) { expect(group[c]).toBe(SPHERE_GROUPS.volume); continue; }
      const o = p.offsets[c]!, q = [0, 1, 2].map((k) => p.connectivity[o + k]!);
      const n = triangleNormal(p.points, q[0]!, q[1]!, q[2]!);
      const i = 3 * q[0]!, radial = n[0] * p.points[i]! + n[1] * p.points[i + 1]! + n[2] * p.points[i + 2]!;
      if (group[c] === SPHERE_GROUPS.wall) { wall++; expect(radial).toBeLessThan(0); } else { outer++; expect(group[c]).toBe(SPHERE_GROUPS.outer); expect(radial).toBeGreaterThan(0); }
    }
    expect(wall).toBe(180);
    expect(outer).toBe(180);
  });
});

describe('sphere sample fields', () => {
  it('point data: exact values, exact zero velocity on the wall, wall shear only on the wall', () => {
    const d = sphereCase({ refinement: 0 }), p = d.pieces[0]!, a = stokes.radius;
    const u = findField(p, 'velocity', 'point')!.values, pr = findField(p, 'p', 'point')!.values, tau = findField(p, 'skinFriction', 'point')!.values;
    const want = new Float64Array(3);
    for (let i = 0; i < p.points.length / 3; i++) {
      const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
      const onWall = Math.abs(Math.hypot(x, y, z) - a) < 1e-15 * a;
      expect(i < 92).toBe(onWall);
      if (onWall) {
        expect([u[3 * i], u[3 * i + 1], u[3 * i + 2]]).toEqual([0, 0, 0]);
        sphereWallShear(stokes, x, y, z, want);
        expect(Array.from(tau.subarray(3 * i, 3 * i + 3))).toEqual(Array.from(want));
      } else {
        sphereVelocity(stokes, x, y, z, want);
        expect(Array.from(u.subarray(3 * i, 3 * i + 3))).toEqual(Array.from(want));
        expect(Array.from(tau.subarray(3 * i, 3 * i + 3))).toEqual([0, 0, 0]);
      }
      expect(pr[i]).toBe(spherePressure(stokes, x, y, z));
    }
  });

  it('cell data: tetrahedra at centroids, boundary triangles at centroids moved onto their sphere; group is Int32', () => {
    const d = sphereCase({ refinement: 0, association: 'cell', precision: 'Float32' }), p = d.pieces[0]!;
    const c = cellCentroids(p), pr = findField(p, 'p', 'cell')!, group = findField(p, 'group', 'cell')!;
    expect(p.pointData.length).toBe(0);
    expect(group.values).toBeInstanceOf(Int32Array);
    expect(group.sourceType).toBe('Int32');
    expect(pr.values).toBeInstanceOf(Float32Array);
    const o = sphereOptions({});
    for (let i = 0; i < p.cellTypes.length; i++) {
      let x = c[3 * i]!, y = c[3 * i + 1]!, z = c[3 * i + 2]!;
      if (group.values[i] !== SPHERE_GROUPS.volume) {
        const s = (group.values[i] === SPHERE_GROUPS.wall ? o.radius : o.outerRadius) / Math.hypot(x, y, z);
        x *= s; y *= s; z *= s;
      }
      expect(pr.values[i]).toBe(Math.fround(spherePressure(o, x, y, z)));
    }
  });

  it('refinement halves the edge: divisions 3·2^level, layers from the shell thickness', () => {
    expect([0, 1, 2, 3].map((refinement) => sphereOptions({ refinement }).divisions)).toEqual([3, 6, 12, 24]);
    expect([0, 1, 2].map((refinement) => sphereOptions({ refinement }).layers)).toEqual([5, 9, 18]);
    expect(sphereOptions({ divisions: 9 }).layers).toBe(14);
    expect(() => sphereCase({ outerRadius: 1e-4 })).toThrow(/outerRadius/);
  });
});
