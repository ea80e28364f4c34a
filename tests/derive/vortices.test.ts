/**
 * Derived vortex quantities against exact flows:
 *  - Lamb–Oseen vortex (Lamb 1932, Hydrodynamics 6th ed. §334a; Oseen 1911): u_θ = Γ/(2πr)(1 − e^{−r²/r_c²}),
 *    ω_z = Γ/(π r_c²)·e^{−r²/r_c²} (from memory; checked as ω_z = (1/r) d(r u_θ)/dr), Q = (u_θ/r)(du_θ/dr)
 *    from the exact velocity gradient of an axisymmetric vortex, and for any planar incompressible flow
 *    S² + Ω² has the in-plane double eigenvalue −Q and 0 across, so λ₂ = −Q (Jeong & Hussain 1995).
 *  - Taylor–Green vortex at t = 0 (Taylor & Green 1937, Proc. R. Soc. A 158, 499; form from memory):
 *    u = V sin x cos y cos z, v = −V cos x sin y cos z, w = 0; ω = V(−cos x sin y sin z, −sin x cos y sin z,
 *    2 sin x sin y cos z) by differentiation; helicity u·ω = 0; Q and λ₂ from the exact gradient, λ₂ by an
 *    independent Jacobi eigenvalue iteration in this file.
 * Each computed on meshes of two sizes: the error falls at second order.
 */
import { describe, expect, it } from 'vitest';
import { withDerivedFields } from '../../src/derive/derivedFields.ts';
import { middleEigenvalue } from '../../src/derive/flowQuantities.ts';
import { datasetOf, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { findField } from '../../src/model/piece.ts';
import { boxMesh, type BoxKind } from '../cut/meshes.ts';

const GAMMA = 0.8, RC = 0.25;

function lambOseen(x: number, y: number): { u: number; v: number; omega: number; q: number } {
  const r2 = x * x + y * y, r = Math.sqrt(r2), e = Math.exp(-r2 / (RC * RC));
  const ut = r > 0 ? (GAMMA / (2 * Math.PI * r)) * (1 - e) : 0;
  // du_θ/dr = −Γ/(2πr²)(1 − e) + Γ/(2πr)·(2r/r_c²)e
  const dut = r > 0 ? (-GAMMA / (2 * Math.PI * r2)) * (1 - e) + (GAMMA / (Math.PI * RC * RC)) * e : GAMMA / (2 * Math.PI * RC * RC);
  const q = r > 0 ? (ut / r) * dut : dut * dut;
  return { u: r > 0 ? (-ut * y) / r : 0, v: r > 0 ? (ut * x) / r : 0, omega: (GAMMA / (Math.PI * RC * RC)) * e, q };
}

/** A box [−1, 1]² × [0, 0.25] around the vortex axis, of `kind` cells, n across. */
function vortexCase(kind: BoxKind, n: number): Dataset {
  const p = boxMesh(kind, n, n, Math.max(2, n / 8), 0.25, { m: [2, 0, 0, 0, 2, 0, 0, 0, 0.25], t: [-1, -1, 0] });
  return datasetOf([withFields(p, [pointFieldFrom(p, 'velocity', 3, (x, y, _z, out) => { const f = lambOseen(x, y); out[0] = f.u; out[1] = f.v; out[2] = 0; })])], `lamb-oseen-${kind}-${n}`);
}

function rmsErrors(d: Dataset, names: string[], exact: (x: number, y: number, z: number, name: string) => number, within = Infinity): number[] {
  const dd = withDerivedFields(d, names), p = dd.pieces[0]!, n = p.points.length / 3;
  return names.map((name) => {
    const f = findField(p, name, 'point')!;
    let s = 0, m = 0;
    for (let i = 0; i < n; i++) {
      const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
      if (Math.hypot(x, y) > within) continue;
      const e = f.values[i]! - exact(x, y, z, name);
      s += e * e; m++;
    }
    return Math.sqrt(s / m);
  });
}

describe('Lamb–Oseen vortex (Lamb 1932 / Oseen 1911)', () => {
  const exact = (x: number, y: number, _z: number, name: string): number => {
    const f = lambOseen(x, y);
    return name === 'q-criterion' ? f.q : name === 'lambda2' ? -f.q : f.omega;
  };
  for (const kind of ['hex', 'tet', 'wedge', 'polyhedron'] as BoxKind[]) {
    it(`${kind}: ω_z, Q and λ₂ = −Q converge at second order`, () => {
      const names = ['vorticity-magnitude', 'q-criterion', 'lambda2'];
      const a = rmsErrors(vortexCase(kind, 16), names, exact, 0.9), b = rmsErrors(vortexCase(kind, 32), names, exact, 0.9);
      const omega0 = GAMMA / (Math.PI * RC * RC);
      names.forEach((n, i) => {
        expect(Math.log2(a[i]! / b[i]!), `${kind} ${n} order`).toBeGreaterThan(1.7);
        const scale = n === 'vorticity-magnitude' ? omega0 : omega0 * omega0 / 4;
        expect(b[i]! / scale, `${kind} ${n} relative RMS error on the fine mesh`).toBeLessThan(0.02);
      });
    });
  }

  it('at the node nearest the axis, mid-height: ω_z and Q = (u_θ/r)(du_θ/dr) within 1.5 % of the peak values (8 cells per core radius)', () => {
    const d = withDerivedFields(vortexCase('hex', 64), ['vorticity', 'q-criterion']), p = d.pieces[0]!;
    let centre = -1, best = Infinity;
    for (let i = 0; i < p.points.length / 3; i++) {
      const r = Math.hypot(p.points[3 * i]!, p.points[3 * i + 1]!) + Math.abs(p.points[3 * i + 2]! - 0.125);
      if (r < best) { best = r; centre = i; }
    }
    const x = p.points[3 * centre]!, y = p.points[3 * centre + 1]!, ex = lambOseen(x, y);
    const w = findField(p, 'vorticity', 'point')!.values, q = findField(p, 'q-criterion', 'point')!.values;
    const omega0 = GAMMA / (Math.PI * RC * RC);
    expect(Math.abs(w[3 * centre + 2]! - ex.omega) / omega0).toBeLessThan(0.015);
    expect(Math.abs(w[3 * centre]!) + Math.abs(w[3 * centre + 1]!)).toBeLessThan(0.005 * omega0);
    expect(Math.abs(q[centre]! - ex.q) / (omega0 * omega0 / 4)).toBeLessThan(0.03);
  });
});

/** Exact velocity gradient of the Taylor–Green field (V = 1), row by row. */
function tgGradient(x: number, y: number, z: number): number[] {
  const sx = Math.sin(x), cx = Math.cos(x), sy = Math.sin(y), cy = Math.cos(y), sz = Math.sin(z), cz = Math.cos(z);
  return [cx * cy * cz, -sx * sy * cz, -sx * cy * sz, sx * sy * cz, -cx * cy * cz, cx * sy * sz, 0, 0, 0];
}

/** Eigenvalues of a symmetric 3×3 matrix by cyclic Jacobi rotations (independent of the closed form), sorted. */
function jacobiEigenvalues(m: number[]): number[] {
  const a = [...m];
  for (let sweep = 0; sweep < 50; sweep++) {
    for (const [p, q] of [[0, 1], [0, 2], [1, 2]] as const) {
      const apq = a[3 * p + q]!;
      if (Math.abs(apq) < 1e-300) continue;
      const theta = (a[3 * q + q]! - a[3 * p + p]!) / (2 * apq);
      const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1)), c = 1 / Math.sqrt(t * t + 1), s = t * c;
      for (let k = 0; k < 3; k++) { // columns p, q
        const akp = a[3 * k + p]!, akq = a[3 * k + q]!;
        a[3 * k + p] = c * akp - s * akq; a[3 * k + q] = s * akp + c * akq;
      }
      for (let k = 0; k < 3; k++) { // rows p, q
        const apk = a[3 * p + k]!, aqk = a[3 * q + k]!;
        a[3 * p + k] = c * apk - s * aqk; a[3 * q + k] = s * apk + c * aqk;
      }
    }
  }
  return [a[0]!, a[4]!, a[8]!].sort((u, v) => u - v);
}

function tgExact(x: number, y: number, z: number, name: string): number {
  const g = tgGradient(x, y, z);
  if (name === 'q-criterion') { let s = 0; for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) s += g[3 * i + j]! * g[3 * j + i]!; return -0.5 * s; }
  if (name === 'lambda2') {
    const A: number[] = [];
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) {
      let s = 0;
      for (let k = 0; k < 3; k++) s += g[3 * i + k]! * g[3 * k + j]! + g[3 * k + i]! * g[3 * j + k]!;
      A.push(0.5 * s);
    }
    return jacobiEigenvalues(A)[1]!;
  }
  if (name === 'helicity') return 0;
  return 2 * Math.sin(x) * Math.sin(y) * Math.cos(z); // ω_z
}

describe('Taylor–Green vortex at t = 0 (Taylor & Green 1937)', () => {
  const tg = (kind: BoxKind, n: number): Dataset => {
    const p = boxMesh(kind, n, n, n, 0.25, { m: [Math.PI, 0, 0, 0, Math.PI, 0, 0, 0, Math.PI], t: [0, 0, 0] });
    return datasetOf([withFields(p, [pointFieldFrom(p, 'U', 3, (x, y, z, out) => {
      out[0] = Math.sin(x) * Math.cos(y) * Math.cos(z); out[1] = -Math.cos(x) * Math.sin(y) * Math.cos(z); out[2] = 0;
    })])]);
  };
  for (const kind of ['hex', 'tet'] as BoxKind[]) {
    it(`${kind}: ω_z, Q, λ₂ and helicity converge at second order`, () => {
      const names = ['q-criterion', 'lambda2', 'helicity'];
      const ez = (d: Dataset): number => {
        const p = withDerivedFields(d, ['vorticity']).pieces[0]!, w = findField(p, 'vorticity', 'point')!.values;
        let s = 0;
        for (let i = 0; i < p.points.length / 3; i++) { const e = w[3 * i + 2]! - tgExact(p.points[3 * i]!, p.points[3 * i + 1]!, p.points[3 * i + 2]!, 'wz'); s += e * e; }
        return Math.sqrt(s / (p.points.length / 3));
      };
      const c = tg(kind, 8), f = tg(kind, 16);
      expect(Math.log2(ez(c) / ez(f)), 'ω_z order').toBeGreaterThan(1.8);
      const a = rmsErrors(c, names, tgExact), b = rmsErrors(f, names, tgExact);
      names.forEach((n, i) => expect(Math.log2(a[i]! / b[i]!), `${kind} ${n} order`).toBeGreaterThan(1.7));
      expect(ez(f)).toBeLessThan(0.03);
    });
  }
});

describe('middle eigenvalue in closed form (Smith 1961)', () => {
  it('equals the Jacobi iteration on random symmetric matrices, repeated eigenvalues included', () => {
    let seed = 3;
    const r = () => { seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0; return seed / 4294967296 - 0.5; };
    for (let k = 0; k < 200; k++) {
      const a = [r(), r(), r(), r(), r(), r()];
      const m = [a[0]!, a[3]!, a[4]!, a[3]!, a[1]!, a[5]!, a[4]!, a[5]!, a[2]!];
      expect(middleEigenvalue(a[0]!, a[1]!, a[2]!, a[3]!, a[4]!, a[5]!)).toBeCloseTo(jacobiEigenvalues(m)[1]!, 12);
    }
    expect(middleEigenvalue(2, 2, -1, 0, 0, 0)).toBeCloseTo(2, 14);
    expect(middleEigenvalue(3, 3, 3, 0, 0, 0)).toBe(3);
  });
});
