/**
 * The pipe sample: mesh quality and geometry, and the Hagen–Poiseuille field it carries.
 * Reference: docs/references.md §1 (Hagen–Poiseuille, C): u = G(R²−r²)/4μ, Q = πGR⁴/8μ, V = u_max/2,
 * f_Darcy = 64/Re, α = 2, β = 4/3. Geometry: the area of a circle, πR².
 */
import { describe, expect, it } from 'vitest';
import { findField } from '../../src/model/piece.ts';
import type { Piece } from '../../src/model/piece.ts';
import { cellCentroids, cellVolumes } from '../../src/samples/cellMeasures.ts';
import { sectionCellArea } from '../../src/samples/extrudeSection.ts';
import { PIPE_LEVELS, pipeCase, pipeExact, pipeSection, pipeVelocity, type PipeOptions } from '../../src/samples/pipe.ts';

const LEVELS = [PIPE_LEVELS.coarse, PIPE_LEVELS.medium, PIPE_LEVELS.fine];

/**
 * Smallest signed volume (×6) of the six tetrahedra around the 0–6 diagonal of each hexahedron and of
 * the six corner tetrahedra of each wedge: all are > 0 only for cells with VTK's positive orientation.
 */
function minSplitVolume(p: Piece): number {
  const hex = [[0, 1, 2, 6], [0, 2, 3, 6], [0, 3, 7, 6], [0, 7, 4, 6], [0, 4, 5, 6], [0, 5, 1, 6]];
  const wedge = [[0, 2, 1, 3], [1, 0, 2, 4], [2, 1, 0, 5], [3, 4, 5, 0], [4, 5, 3, 1], [5, 3, 4, 2]];
  let min = Infinity;
  const P = p.points;
  for (let c = 0; c < p.cellTypes.length; c++) {
    const o = p.offsets[c]!, split = p.cellTypes[c] === 12 ? hex : wedge;
    for (const t of split) {
      const [a, b, cc, d] = t.map((k) => 3 * p.connectivity[o + k]!) as [number, number, number, number];
      const u = [P[b]! - P[a]!, P[b + 1]! - P[a + 1]!, P[b + 2]! - P[a + 2]!];
      const v = [P[cc]! - P[a]!, P[cc + 1]! - P[a + 1]!, P[cc + 2]! - P[a + 2]!];
      const w = [P[d]! - P[a]!, P[d + 1]! - P[a + 1]!, P[d + 2]! - P[a + 2]!];
      min = Math.min(min, u[0]! * (v[1]! * w[2]! - v[2]! * w[1]!) - u[1]! * (v[0]! * w[2]! - v[2]! * w[0]!) + u[2]! * (v[0]! * w[1]! - v[1]! * w[0]!));
    }
  }
  return min;
}

/** Mesh volume (m³) of all pieces. */
const volumeOf = (o: Partial<PipeOptions>) => pipeCase(o).pieces.reduce((s, p) => s + cellVolumes(p).reduce((a, b) => a + b, 0), 0);

/** Gauss points on [0, 1] (2-point rule) for bilinear quadrature. */
const G2 = [0.5 - 0.5 / Math.sqrt(3), 0.5 + 0.5 / Math.sqrt(3)];

/**
 * ∫ f dA over the section, with f interpolated from node values: bilinear on quads (2×2 Gauss, exact
 * for the bilinear map's area), linear on triangles (centroid rule). Returns [∫ f dA, ∫ f² dA, ∫ f³ dA].
 */
function sectionIntegrals(o: Partial<PipeOptions>): [number, number, number] {
  const s = pipeSection(o), e = pipeExact(o);
  const f = (i: number) => pipeVelocity(e, s.points[2 * i]!, s.points[2 * i + 1]!);
  const out: [number, number, number] = [0, 0, 0];
  for (let c = 0; c < s.offsets.length - 1; c++) {
    const a = s.offsets[c]!, n = s.offsets[c + 1]! - a, id = (k: number) => s.nodes[a + k]!;
    if (n === 3) {
      const fm = (f(id(0)) + f(id(1)) + f(id(2))) / 3, A = sectionCellArea(s, c);
      // Exact for the linear interpolant of f, f², f³ needs more points: use the edge midpoints (degree 2).
      const mids = [[0, 1], [1, 2], [2, 0]].map(([i, j]) => (f(id(i!)) + f(id(j!))) / 2);
      out[0] += fm * A;
      out[1] += (A / 3) * mids.reduce((q, m) => q + m * m, 0);
      out[2] += (A / 3) * mids.reduce((q, m) => q + m * m * m, 0);
      continue;
    }
    const X = [0, 1, 2, 3].map((k) => s.points[2 * id(k)]!), Y = [0, 1, 2, 3].map((k) => s.points[2 * id(k) + 1]!), F = [0, 1, 2, 3].map((k) => f(id(k)));
    for (const u of G2) for (const v of G2) {
      const N = [(1 - u) * (1 - v), u * (1 - v), u * v, (1 - u) * v];
      const dNu = [-(1 - v), 1 - v, v, -v], dNv = [-(1 - u), -u, u, 1 - u];
      let xu = 0, xv = 0, yu = 0, yv = 0, fv = 0;
      for (let k = 0; k < 4; k++) { xu += dNu[k]! * X[k]!; xv += dNv[k]! * X[k]!; yu += dNu[k]! * Y[k]!; yv += dNv[k]! * Y[k]!; fv += N[k]! * F[k]!; }
      const J = (xu * yv - xv * yu) / 4;
      out[0] += fv * J; out[1] += fv * fv * J; out[2] += fv * fv * fv * J;
    }
  }
  return out;
}

const order = (e1: number, e2: number, e3: number, r: number) => [Math.log(Math.abs(e1 / e2)) / Math.log(r), Math.log(Math.abs(e2 / e3)) / Math.log(r)];

describe('pipe sample: exact numbers (docs/references.md §1)', () => {
  it('Hagen–Poiseuille relations hold for the default water pipe', () => {
    const e = pipeExact();
    // Reference: Hagen–Poiseuille, docs/references.md §1 (C): Q = πGR⁴/8μ, V = u_max/2, f_Darcy = 64/Re; §10 water at 20 °C.
    expect(e.Q).toBeCloseTo((Math.PI * e.G * e.R ** 4) / (8 * e.mu), 18);
    expect(e.Q / e.area).toBeCloseTo(e.V, 15);
    expect(e.uMax).toBe(2 * e.V);
    expect(e.fDarcy * e.Re).toBeCloseTo(64, 12);
    expect(e.rho).toBe(998.207);
    expect(e.mu).toBe(1.0016e-3);
    expect(e.Re).toBeCloseTo((998.207 * 0.05 * 0.02) / 1.0016e-3, 9);
    expect(e.wallShearStress).toBeCloseTo((4 * e.mu * e.V) / e.R, 15);
    // Darcy–Weisbach: Δp = f (L/D) ρV²/2.
    expect(e.dp).toBeCloseTo(e.fDarcy * (e.L / (2 * e.R)) * 0.5 * e.rho * e.V ** 2, 12);
  });

  it('the profile satisfies (1/r) d/dr(r du/dr) = −G/μ with u(R) = 0 (finite differences)', () => {
    const e = pipeExact(), h = 1e-4 * e.R;
    for (const r of [0.1, 0.37, 0.6, 0.93].map((s) => s * e.R)) {
      const u = (q: number) => pipeVelocity(e, q, 0);
      const lap = (u(r + h) - 2 * u(r) + u(r - h)) / (h * h) + (u(r + h) - u(r - h)) / (2 * h * r);
      expect(lap / (-e.G / e.mu)).toBeCloseTo(1, 6);
    }
    expect(pipeVelocity(e, e.R, 0)).toBe(0);
    expect(pipeVelocity(e, 0, 0)).toBe(e.uMax);
  });
});

describe('pipe sample: mesh', () => {
  for (const core of ['hex', 'wedge'] as const) {
    it(`${core} core: every cell positively oriented, wall nodes on r = R, none outside`, () => {
      for (const lv of LEVELS) {
        const d = pipeCase({ ...lv, core });
        const p = d.pieces[0]!, R = 0.01;
        expect(minSplitVolume(p)).toBeGreaterThan(0);
        let onWall = 0;
        for (let i = 0; i < p.points.length; i += 3) {
          const r = Math.hypot(p.points[i]!, p.points[i + 1]!);
          expect(r).toBeLessThanOrEqual(R * (1 + 2e-16));
          if (Math.abs(r - R) <= 2e-16 * R) onWall++;
        }
        expect(onWall).toBe(lv.nTheta * (lv.nAxial + 1));
      }
    });

    it(`${core} core: mesh volume converges to πR²L at second order (refinement ratio 1.5)`, () => {
      const exact = Math.PI * 0.01 ** 2 * 0.1;
      const err = LEVELS.map((lv) => volumeOf({ ...lv, core }) - exact);
      for (const x of err) expect(x).toBeLessThan(0);
      const [p1, p2] = order(err[0]!, err[1]!, err[2]!, 1.5);
      expect(p1).toBeCloseTo(2, 1);
      expect(p2).toBeCloseTo(2, 1);
      expect(Math.abs(err[2]! / exact)).toBeLessThan(0.006);
    });
  }

  it('hex core cells have sensible shape: section cell areas within a factor 3 of each other', () => {
    for (const lv of LEVELS) {
      const s = pipeSection(lv);
      const areas = Array.from({ length: s.offsets.length - 1 }, (_, c) => sectionCellArea(s, c));
      expect(Math.max(...areas) / Math.min(...areas)).toBeLessThan(3);
    }
  });

  it('cell counts: m² core + nTheta·nRadial ring per layer; wedge core nTheta wedges at the axis', () => {
    const h = pipeCase(PIPE_LEVELS.medium).pieces[0]!;
    expect(h.cellTypes.length).toBe((6 * 6 + 24 * 6) * 24);
    const w = pipeCase({ ...PIPE_LEVELS.medium, core: 'wedge' }).pieces[0]!;
    expect(w.cellTypes.filter((t) => t === 13).length).toBe(24 * 24);
    expect(w.cellTypes.filter((t) => t === 12).length).toBe(24 * 5 * 24);
  });

  it('pieces split the pipe along z without changing the cells', () => {
    const one = pipeCase(PIPE_LEVELS.coarse), three = pipeCase({ ...PIPE_LEVELS.coarse, pieces: 3 });
    expect(three.pieces.length).toBe(3);
    expect(three.pieces.reduce((s, p) => s + p.cellTypes.length, 0)).toBe(one.pieces[0]!.cellTypes.length);
    const zmax = (p: Piece) => Math.max(...p.points.filter((_, i) => i % 3 === 2));
    const zmin = (p: Piece) => Math.min(...p.points.filter((_, i) => i % 3 === 2));
    expect(zmax(three.pieces[0]!)).toBe(zmin(three.pieces[1]!));
    expect(zmax(three.pieces[1]!)).toBe(zmin(three.pieces[2]!));
    expect(zmin(three.pieces[0]!)).toBe(0);
    expect(zmax(three.pieces[2]!)).toBe(0.1);
  });

  it('rejects options it cannot mesh, naming them', () => {
    expect(() => pipeCase({ nTheta: 10 })).toThrow(/nTheta = 10 must be a multiple of 4/);
    expect(() => pipeCase({ radius: -1 })).toThrow(/radius must be a positive number/);
    expect(() => pipeCase({ nAxial: 2, pieces: 3 })).toThrow(/3 pieces/);
  });
});

describe('pipe sample: fields', () => {
  it('point data are the exact velocity and pressure at the nodes', () => {
    const d = pipeCase(PIPE_LEVELS.coarse), e = pipeExact(), p = d.pieces[0]!;
    const u = findField(p, 'velocity', 'point')!, pr = findField(p, 'p', 'point')!;
    expect(u.components).toBe(3);
    for (let i = 0; i < p.points.length / 3; i++) {
      const x = p.points[3 * i]!, y = p.points[3 * i + 1]!, z = p.points[3 * i + 2]!;
      expect(u.values[3 * i]).toBe(0);
      expect(u.values[3 * i + 1]).toBe(0);
      expect(u.values[3 * i + 2]).toBeCloseTo(2 * e.V * (1 - (x * x + y * y) / e.R ** 2), 15);
      expect(pr.values[i]).toBeCloseTo(e.G * (e.L - z), 15);
    }
  });

  it('cell data are the exact values at the cell centroids (centroid of an extruded cell = section-area centroid)', () => {
    const d = pipeCase({ ...PIPE_LEVELS.coarse, association: 'cell', core: 'wedge' }), e = pipeExact(), p = d.pieces[0]!;
    const c = cellCentroids(p), u = findField(p, 'velocity', 'cell')!, pr = findField(p, 'p', 'cell')!;
    expect(p.pointData.length).toBe(0);
    for (let i = 0; i < p.cellTypes.length; i++) {
      expect(u.values[3 * i + 2]).toBe(pipeVelocity(e, c[3 * i]!, c[3 * i + 1]!));
      expect(pr.values[i]).toBeCloseTo(e.G * (e.L - c[3 * i + 2]!), 15);
    }
    // First cell: a wedge at the axis; its centroid is the triangle's centroid, half-way up the layer.
    const o = p.offsets[0]!, ids = [0, 1, 2].map((k) => p.connectivity[o + k]!);
    expect(c[0]).toBeCloseTo(ids.reduce((s, q) => s + p.points[3 * q]!, 0) / 3, 16);
    expect(c[2]).toBeCloseTo(0.1 / 16 / 2, 16);
  });

  it('flow rate, β and α from the interpolated profile converge to Q, 4/3 and 2 (Hagen–Poiseuille, docs/references.md §1)', () => {
    const e = pipeExact();
    const res = LEVELS.map((lv) => sectionIntegrals(lv));
    const Qerr = res.map((r) => r[0] - e.Q);
    // Reference: Hagen–Poiseuille, docs/references.md §1 (C), Q = πR²V; β = ∫u²dA/(V²A) = 4/3; α = ∫u³dA/(V³A) = 2.
    const [p1, p2] = order(Qerr[0]!, Qerr[1]!, Qerr[2]!, 1.5);
    expect(p1).toBeGreaterThan(1.8);
    expect(p2).toBeGreaterThan(1.8);
    expect(Math.abs(Qerr[2]! / e.Q)).toBeLessThan(0.01);
    const fine = res[2]!;
    expect(fine[1] / (e.V ** 2 * e.area)).toBeCloseTo(4 / 3, 1);
    expect(fine[2] / (e.V ** 3 * e.area)).toBeCloseTo(2, 1);
  });
});
