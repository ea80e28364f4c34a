/**
 * Sample field: laminar water flow (20 °C) in a straight coolant pipe, fully developed
 * (Hagen–Poiseuille, docs/references.md §1). The pipe runs along +z from z = 0 (inlet) to
 * z = length (outlet), axis on the z-axis. SI units throughout.
 *
 * Mesh: the cross-section is an O-grid — a ring of quadrilaterals following the wall around either a
 * block of quadrilaterals with slightly bulged sides (`core: 'hex'`) or a fan of triangles around the
 * axis (`core: 'wedge'`) — extruded into hexahedra (and wedges). Wall nodes lie on r = R (to rounding).
 * The cross-section area converges to πR² at second order in 1/nTheta.
 */
import type { Dataset } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import { datasetOf, field } from '../model/meshBuild.ts';
import type { Piece } from '../model/piece.ts';
import { validatePiece } from '../model/validate.ts';
import { cellCentroids } from './cellMeasures.ts';
import { checkSection, extrudeSection, type Section } from './extrudeSection.ts';

export interface PipeOptions {
  /** Pipe radius R (m). Default 0.01. */
  radius: number;
  /** Pipe length L (m). Default 0.1. */
  length: number;
  /** Mean (bulk) velocity V (m/s). Default 0.05 (Re ≈ 997). */
  meanVelocity: number;
  /** Density (kg/m³). Default 998.207 (water, 20 °C, IAPWS-95 and IAPWS-2008, docs/references.md §10). */
  rho: number;
  /** Dynamic viscosity (Pa·s). Default 1.0016e-3 (water, 20 °C, IAPWS-95 and IAPWS-2008, docs/references.md §10). */
  mu: number;
  /** Cells radially: ring layers between the core and the wall (hex core) or from the axis to the wall (wedge core). Default 6. */
  nRadial: number;
  /** Cells around the circumference (a multiple of 4 for the hex core). Default 24. */
  nTheta: number;
  /** Cell layers along the pipe. Default 24. */
  nAxial: number;
  /** Core of the O-grid: a block of hexahedra, or wedges around the axis. Default `hex`. */
  core: 'hex' | 'wedge';
  /** Half-width of the hex core block over R (its sides bulge outward a little). Default 0.4. */
  coreSize: number;
  /** Fields as point data (values at nodes) or cell data (values at cell centroids). Default `point`. */
  association: 'point' | 'cell';
  /** Number of pieces, split along z (interface nodes repeated in both pieces, as partitioned output is). Default 1. */
  pieces: number;
  /** Element type of the fields (points are always Float64). Default `Float64`. */
  precision: 'Float64' | 'Float32';
}

export const PIPE_DEFAULTS: Readonly<PipeOptions> = {
  radius: 0.01, length: 0.1, meanVelocity: 0.05, rho: 998.207, mu: 1.0016e-3,
  nRadial: 6, nTheta: 24, nAxial: 24, core: 'hex', coreSize: 0.4, association: 'point', pieces: 1, precision: 'Float64',
};

/** Resolutions for a grid-convergence study: each level refines every direction by 1.5 (cell count by 3.375). */
export const PIPE_LEVELS = {
  coarse: { nTheta: 16, nRadial: 4, nAxial: 16 },
  medium: { nTheta: 24, nRadial: 6, nAxial: 24 },
  fine: { nTheta: 36, nRadial: 9, nAxial: 36 },
} as const satisfies Record<string, Partial<PipeOptions>>;

/** Exact values of the fully developed flow (Hagen–Poiseuille, docs/references.md §1). */
export interface PipeExact {
  /** Radius (m), length (m), mean velocity (m/s), density (kg/m³), viscosity (Pa·s). */
  R: number; L: number; V: number; rho: number; mu: number;
  /** Pressure gradient G = −dp/dz = 8μV/R² (Pa/m). */
  G: number;
  /** Volume flow rate πR²V (m³/s) and mass flow rate ρQ (kg/s). */
  Q: number; massFlow: number;
  /** Cross-section area πR² (m²). */
  area: number;
  /** Centre-line velocity 2V (m/s). */
  uMax: number;
  /** Reynolds number ρV·2R/μ (on the diameter). */
  Re: number;
  /** Pressure drop over the length, G·L (Pa). */
  dp: number;
  /** Wall shear stress GR/2 = 4μV/R (Pa). */
  wallShearStress: number;
  /** Darcy friction factor 64/Re. */
  fDarcy: number;
  /** Kinetic-energy (α = 2) and momentum (β = 4/3) flux coefficients. */
  alpha: number; beta: number;
}

/** Full options from partial ones, checked. */
export function pipeOptions(o: Partial<PipeOptions> = {}): PipeOptions {
  const r: PipeOptions = { ...PIPE_DEFAULTS, ...o };
  for (const k of ['radius', 'length', 'meanVelocity', 'rho', 'mu', 'coreSize'] as const) {
    if (!(r[k] > 0) || !Number.isFinite(r[k])) throw new Error(`pipeCase: ${k} must be a positive number, got ${r[k]}`);
  }
  if (r.coreSize >= 0.65) throw new Error(`pipeCase: coreSize ${r.coreSize} leaves no room for the ring (expected < 0.65)`);
  for (const k of ['nRadial', 'nTheta', 'nAxial', 'pieces'] as const) {
    if (!Number.isInteger(r[k]) || r[k] < 1) throw new Error(`pipeCase: ${k} must be a positive integer, got ${r[k]}`);
  }
  if (r.core === 'hex' && r.nTheta % 4 !== 0) throw new Error(`pipeCase: nTheta = ${r.nTheta} must be a multiple of 4 for core 'hex'`);
  if (r.nTheta < 3) throw new Error(`pipeCase: nTheta = ${r.nTheta}, expected at least 3`);
  if (r.pieces > r.nAxial) throw new Error(`pipeCase: ${r.pieces} pieces need at least as many axial layers, got nAxial = ${r.nAxial}`);
  return r;
}

/** The exact solution's numbers for the given options (Hagen–Poiseuille, docs/references.md §1). */
export function pipeExact(o: Partial<PipeOptions> = {}): PipeExact {
  const { radius: R, length: L, meanVelocity: V, rho, mu } = pipeOptions(o);
  const G = 8 * mu * V / (R * R), Re = rho * V * 2 * R / mu, Q = Math.PI * R * R * V;
  return {
    R, L, V, rho, mu, G, Q, massFlow: rho * Q, area: Math.PI * R * R, uMax: 2 * V, Re, dp: G * L,
    wallShearStress: G * R / 2, fDarcy: 64 / Re, alpha: 2, beta: 4 / 3,
  };
}

/** Axial velocity u_z = 2V(1 − r²/R²) at (x, y) (m/s); the other components are zero. Zero outside the pipe. */
export function pipeVelocity(e: PipeExact, x: number, y: number): number {
  const s = 1 - (x * x + y * y) / (e.R * e.R);
  return s > 0 ? 2 * e.V * s : 0;
}

/** Pressure G·(L − z) (Pa): zero at the outlet. */
export function pipePressure(e: PipeExact, z: number): number {
  return e.G * (e.L - z);
}

/** Points of the core block's boundary at the ray angle `theta`: four circular arcs through the block corners. */
function coreRadius(rho: number, theta: number): number {
  // Bulge: each side's tangent turns 15° at the corners, so corner cells get 120° angles instead of 90°/135°.
  const phi = Math.PI / 12, xc = rho * (1 - 1 / Math.tan(phi)), rc = rho / Math.sin(phi);
  const side = Math.round(theta / (Math.PI / 2));
  const alpha = theta - side * (Math.PI / 2);
  const sa = Math.sin(alpha);
  return xc * Math.cos(alpha) + Math.sqrt(rc * rc - xc * xc * sa * sa);
}

/** Cross-section with a hex core: core block (m×m, m = nTheta/4), then nRadial ring layers out to the wall. */
function hexCoreSection(o: PipeOptions): Section {
  const R = o.radius, m = o.nTheta / 4, nT = o.nTheta, nR = o.nRadial, rho = o.coreSize * R;
  const nCore = (m + 1) * (m + 1), nPts = nCore + nR * nT;
  const pts = new Float64Array(2 * nPts);
  const theta = (t: number) => -0.75 * Math.PI + (2 * Math.PI * t) / nT;
  // Perimeter position t (counter-clockwise from the (−,−) corner) → core lattice node.
  const perim = (t: number): number => {
    const side = Math.floor(t / m), r = t % m;
    const [i, j] = side === 0 ? [r, 0] : side === 1 ? [m, r] : side === 2 ? [m - r, m] : [0, m - r];
    return j * (m + 1) + i;
  };
  const cx = new Float64Array(nT), cy = new Float64Array(nT);
  for (let t = 0; t < nT; t++) {
    const th = theta(t), rc = coreRadius(rho, th);
    cx[t] = rc * Math.cos(th); cy[t] = rc * Math.sin(th);
  }
  const at = (t: number, d: 0 | 1) => (d === 0 ? cx : cy)[((t % nT) + nT) % nT]!;
  // Core interior: transfinite (Coons) interpolation of the four sides.
  for (let j = 0; j <= m; j++) for (let i = 0; i <= m; i++) {
    const u = i / m, v = j / m, q = j * (m + 1) + i;
    for (const d of [0, 1] as const) {
      const B = at(i, d), T = at(3 * m - i, d), L = at(4 * m - j, d), Rr = at(m + j, d);
      const c00 = at(0, d), c10 = at(m, d), c11 = at(2 * m, d), c01 = at(3 * m, d);
      pts[2 * q + d] = (1 - u) * L + u * Rr + (1 - v) * B + v * T
        - ((1 - u) * (1 - v) * c00 + u * (1 - v) * c10 + u * v * c11 + (1 - u) * v * c01);
    }
  }
  for (let t = 0; t < nT; t++) { const q = perim(t); pts[2 * q] = cx[t]!; pts[2 * q + 1] = cy[t]!; }
  const ring = (t: number, k: number) => (k === 0 ? perim(t % nT) : nCore + (k - 1) * nT + (t % nT));
  for (let k = 1; k <= nR; k++) for (let t = 0; t < nT; t++) {
    const q = ring(t, k), th = theta(t);
    if (k === nR) { pts[2 * q] = R * Math.cos(th); pts[2 * q + 1] = R * Math.sin(th); continue; }
    const s = k / nR, wx = R * Math.cos(th), wy = R * Math.sin(th);
    pts[2 * q] = cx[t]! + s * (wx - cx[t]!); pts[2 * q + 1] = cy[t]! + s * (wy - cy[t]!);
  }
  const nCells = m * m + nT * nR, nodes = new Int32Array(4 * nCells), offsets = new Int32Array(nCells + 1);
  let c = 0;
  const quad = (a: number, b: number, cc: number, d: number) => {
    nodes.set([a, b, cc, d], 4 * c); c++; offsets[c] = 4 * c;
  };
  for (let j = 0; j < m; j++) for (let i = 0; i < m; i++) {
    const q = j * (m + 1) + i;
    quad(q, q + 1, q + m + 2, q + m + 1);
  }
  // Ring quads: outward first, then counter-clockwise, which is counter-clockwise seen from +z.
  for (let k = 0; k < nR; k++) for (let t = 0; t < nT; t++) quad(ring(t, k), ring(t, k + 1), ring(t + 1, k + 1), ring(t + 1, k));
  return { points: pts, offsets, nodes };
}

/** Cross-section with a wedge core: nRadial rings from the axis to the wall, triangles at the axis. */
function wedgeCoreSection(o: PipeOptions): Section {
  const R = o.radius, nT = o.nTheta, nR = o.nRadial;
  const pts = new Float64Array(2 * (1 + nR * nT));
  const idx = (t: number, k: number) => (k === 0 ? 0 : 1 + (k - 1) * nT + (t % nT));
  for (let k = 1; k <= nR; k++) for (let t = 0; t < nT; t++) {
    const th = (2 * Math.PI * t) / nT, r = k === nR ? R : (R * k) / nR, q = idx(t, k);
    pts[2 * q] = r * Math.cos(th); pts[2 * q + 1] = r * Math.sin(th);
  }
  const offsets = new Int32Array(nT * nR + 1), nodes: number[] = [];
  let c = 0;
  for (let t = 0; t < nT; t++) { nodes.push(0, idx(t, 1), idx(t + 1, 1)); offsets[++c] = nodes.length; }
  for (let k = 1; k < nR; k++) for (let t = 0; t < nT; t++) {
    nodes.push(idx(t, k), idx(t, k + 1), idx(t + 1, k + 1), idx(t + 1, k));
    offsets[++c] = nodes.length;
  }
  return { points: pts, offsets, nodes: Int32Array.from(nodes) };
}

/** The cross-section mesh (xy, m) of the pipe for the given options. */
export function pipeSection(o: Partial<PipeOptions> = {}): Section {
  const r = pipeOptions(o);
  const s = r.core === 'hex' ? hexCoreSection(r) : wedgeCoreSection(r);
  checkSection(s, 'pipeSection');
  return s;
}

/** Velocity and pressure fields of a piece: at nodes, or at cell centroids. */
function pipeFields(p: Piece, e: PipeExact, o: PipeOptions): FieldArray[] {
  const at = o.association === 'point' ? p.points : cellCentroids(p);
  const n = at.length / 3;
  const u = o.precision === 'Float32' ? new Float32Array(3 * n) : new Float64Array(3 * n);
  const pr = o.precision === 'Float32' ? new Float32Array(n) : new Float64Array(n);
  for (let i = 0; i < n; i++) {
    u[3 * i + 2] = pipeVelocity(e, at[3 * i]!, at[3 * i + 1]!);
    pr[i] = pipePressure(e, at[3 * i + 2]!);
  }
  return [field('velocity', o.association, 3, u), field('p', o.association, 1, pr)];
}

/**
 * The pipe sample: hexahedral O-grid (plus wedges with the wedge core) with `velocity` (m/s) and `p`
 * (Pa) as point or cell data. Pieces split the pipe along z.
 */
export function pipeCase(o: Partial<PipeOptions> = {}): Dataset {
  const r = pipeOptions(o);
  const e = pipeExact(r);
  const section = pipeSection(r);
  const zs = Array.from({ length: r.nAxial + 1 }, (_, l) => (l === r.nAxial ? r.length : (r.length * l) / r.nAxial));
  const pieces: Piece[] = [];
  for (let k = 0; k < r.pieces; k++) {
    const l0 = Math.round((k * r.nAxial) / r.pieces), l1 = Math.round(((k + 1) * r.nAxial) / r.pieces);
    const mesh = extrudeSection(section, zs.slice(l0, l1 + 1));
    const fields = pipeFields(mesh, e, r);
    const piece: Piece = r.association === 'point' ? { ...mesh, pointData: fields } : { ...mesh, cellData: fields };
    validatePiece(piece, 'pipeCase');
    pieces.push(piece);
  }
  return datasetOf(pieces, `pipe (${r.core} core, ${r.nTheta}×${r.nRadial}×${r.nAxial}, ${r.association} data)`);
}
