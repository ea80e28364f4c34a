/**
 * Sample field: fully developed laminar water flow (20 °C) in a straight rectangular cooling channel
 * of a cold plate (square by default), along +z from z = 0 (inlet) to z = length (outlet);
 * cross-section |x| ≤ a, |y| ≤ b. Exact solution: the Fourier series of White, Viscous Fluid Flow §3-3 (docs/references.md §2).
 *
 * Series (docs/references.md §2, with its y → our x, its z → our y): with λ_k = (2k+1)π/(2a),
 *   u = (G/2μ)(a² − x²) − (16a²G/μπ³) Σ_k (−1)^k cos(λ_k x) cosh(λ_k y)/cosh(λ_k b) / (2k+1)³,
 * the first term being the closed form of the series' "1" part. The same holds with (x, a) and (y, b)
 * swapped; the evaluation uses the form whose cosh terms decay faster at the point, and sums until the
 * bounded tail is below 1e-16 of the series scale (1e-12 relative accuracy or better everywhere; slowest
 * within about 1e-6·a of a corner, where the terms decay algebraically).
 * Mesh: uniform hexahedra, exact on the walls (the duct is flat-walled).
 */
import type { Dataset } from '../model/dataset.ts';
import { datasetOf, field, hexGrid } from '../model/meshBuild.ts';
import type { Piece } from '../model/piece.ts';
import { validatePiece } from '../model/validate.ts';
import { cellCentroids } from './cellMeasures.ts';

export interface DuctOptions {
  /** Half-width a in x (m). Default 0.005 (a 10 mm × 10 mm channel). */
  halfWidth: number;
  /** Half-height b in y (m). Default 0.005. */
  halfHeight: number;
  /** Channel length (m). Default 0.1. */
  length: number;
  /** Mean velocity V (m/s). Default 0.05 (Re ≈ 498 on the hydraulic diameter). */
  meanVelocity: number;
  /** Density (kg/m³). Default 998.207 (water, 20 °C, IAPWS-95 and IAPWS-2008, docs/references.md §10). */
  rho: number;
  /** Dynamic viscosity (Pa·s). Default 1.0016e-3 (water, 20 °C, IAPWS-95 and IAPWS-2008, docs/references.md §10). */
  mu: number;
  /** Cells across x, across y and along z. Defaults 20, 20, 20. */
  nx: number; ny: number; nz: number;
  /** Fields as point data or cell data (at cell centroids). Default `point`. */
  association: 'point' | 'cell';
  /** Element type of the fields. Default `Float64`. */
  precision: 'Float64' | 'Float32';
}

export const DUCT_DEFAULTS: Readonly<DuctOptions> = {
  halfWidth: 0.005, halfHeight: 0.005, length: 0.1, meanVelocity: 0.05, rho: 998.207, mu: 1.0016e-3,
  nx: 20, ny: 20, nz: 20, association: 'point', precision: 'Float64',
};

/** Exact values of the fully developed flow (docs/references.md §2). */
export interface DuctExact {
  /** Half-width a (m), half-height b (m), length (m), mean velocity (m/s), density, viscosity. */
  a: number; b: number; L: number; V: number; rho: number; mu: number;
  /** Pressure gradient G = −dp/dz (Pa/m), from V and the series for Q. */
  G: number;
  /** Volume flow rate (m³/s), mass flow rate (kg/s), area 4ab (m²). */
  Q: number; massFlow: number; area: number;
  /** Hydraulic diameter 4A/P = 4ab/(a+b) (m). */
  Dh: number;
  /** Reynolds number ρV·Dh/μ. */
  Re: number;
  /** Darcy fRe = 2G·Dh²/(μV) (56.908 for a square) and Fanning fRe (a quarter of it). */
  fRe: number; fReFanning: number;
  /** Centre-line velocity (m/s). */
  uMax: number;
  /** Pressure drop over the length (Pa) and perimeter-mean wall shear stress G·A/P (Pa). */
  dp: number; wallShearStress: number;
}

/** Full options from partial ones, checked. */
export function ductOptions(o: Partial<DuctOptions> = {}): DuctOptions {
  const r: DuctOptions = { ...DUCT_DEFAULTS, ...o };
  for (const k of ['halfWidth', 'halfHeight', 'length', 'meanVelocity', 'rho', 'mu'] as const) {
    if (!(r[k] > 0) || !Number.isFinite(r[k])) throw new Error(`ductCase: ${k} must be a positive number, got ${r[k]}`);
  }
  for (const k of ['nx', 'ny', 'nz'] as const) {
    if (!Number.isInteger(r[k]) || r[k] < 1) throw new Error(`ductCase: ${k} must be a positive integer, got ${r[k]}`);
  }
  return r;
}

/**
 * Q/G of the rectangle |x| ≤ halfWidth, |y| ≤ halfHeight (m), in m⁴/(Pa·s): Q = G·ductFlowPerGradient. docs/references.md §2,
 * Q = (4ba³G/3μ)[1 − (192a/π⁵b) Σ_odd tanh(iπb/2a)/i⁵] with a ≤ b (the roles are symmetric).
 */
export function ductFlowPerGradient(halfWidth: number, halfHeight: number, mu: number): number {
  const a = Math.min(halfWidth, halfHeight), b = Math.max(halfWidth, halfHeight);
  let s = 0;
  // Tail after i = 40001 is below 1/(8·40001⁴) ≈ 5e-20 of the sum.
  for (let i = 40001; i >= 1; i -= 2) s += Math.tanh((i * Math.PI * b) / (2 * a)) / (i * i * i * i * i);
  return ((4 * b * a * a * a) / (3 * mu)) * (1 - ((192 * a) / (Math.PI ** 5 * b)) * s);
}

/** The exact solution's numbers for the given options. */
export function ductExact(o: Partial<DuctOptions> = {}): DuctExact {
  const { halfWidth: a, halfHeight: b, length: L, meanVelocity: V, rho, mu } = ductOptions(o);
  const area = 4 * a * b, Q = V * area, G = Q / ductFlowPerGradient(a, b, mu);
  const Dh = (4 * a * b) / (a + b), fRe = (2 * G * Dh * Dh) / (mu * V);
  const partial = { a, b, G, mu };
  return {
    a, b, L, V, rho, mu, G, Q, massFlow: rho * Q, area, Dh, Re: (rho * V * Dh) / mu, fRe, fReFanning: fRe / 4,
    uMax: ductVelocity(partial, 0, 0), dp: G * L, wallShearStress: (G * area) / (4 * (a + b)),
  };
}

/** The series part Σ_k (−1)^k cos(λ_k s) cosh(λ_k t)/cosh(λ_k h)/(2k+1)³, λ_k = (2k+1)π/(2w), for |s| < w, |t| < h. */
function coshSeries(s: number, w: number, t: number, h: number): number {
  const at = Math.abs(t), q = Math.exp((-Math.PI * (h - at)) / w);
  let sum = 0;
  for (let k = 0; ; k++) {
    const i = 2 * k + 1, lam = (i * Math.PI) / (2 * w);
    // cosh(λt)/cosh(λh) without overflow.
    const ratio = (Math.exp(lam * (at - h)) * (1 + Math.exp(-2 * lam * at))) / (1 + Math.exp(-2 * lam * h));
    const term = (Math.cos(lam * s) * ratio) / (i * i * i);
    sum += k % 2 === 0 ? term : -term;
    // Later terms are bounded by 2·e^{−λ(h−|t|)}/i³ times a geometric factor q per step, and by 1/i³ alone.
    const bound = (2 * Math.exp(lam * (at - h))) / (i * i * i);
    const tail = Math.min(bound / Math.max(1 - q, 1e-300), 1 / (4 * i * i));
    if (tail < 1e-16 || k > 4_000_000) return sum;
  }
}

/** Axial velocity (m/s) at (x, y) for half-sizes a, b, gradient G and viscosity mu; 0 on and outside the walls. */
export function ductVelocity(e: { a: number; b: number; G: number; mu: number }, x: number, y: number): number {
  const { a, b, G, mu } = e;
  const ax = Math.abs(x), ay = Math.abs(y);
  if (ax >= a || ay >= b) return 0;
  // Form in cos(x) (cosh decays towards y = ±b) or its mirror; pick the one with faster decay.
  const useX = (b - ay) / a >= (a - ax) / b;
  if (useX) return (G / (2 * mu)) * (a * a - x * x) - ((16 * a * a * G) / (mu * Math.PI ** 3)) * coshSeries(x, a, y, b);
  return (G / (2 * mu)) * (b * b - y * y) - ((16 * b * b * G) / (mu * Math.PI ** 3)) * coshSeries(y, b, x, a);
}

/** As `ductVelocity`, forcing one of the two series forms (`x`: cos in x; `y`: cos in y). For tests. */
export function ductVelocityForm(e: { a: number; b: number; G: number; mu: number }, x: number, y: number, form: 'x' | 'y'): number {
  const { a, b, G, mu } = e;
  if (Math.abs(x) >= a || Math.abs(y) >= b) return 0;
  if (form === 'x') return (G / (2 * mu)) * (a * a - x * x) - ((16 * a * a * G) / (mu * Math.PI ** 3)) * coshSeries(x, a, y, b);
  return (G / (2 * mu)) * (b * b - y * y) - ((16 * b * b * G) / (mu * Math.PI ** 3)) * coshSeries(y, b, x, a);
}

/** Pressure G·(L − z) (Pa): zero at the outlet. */
export function ductPressure(e: DuctExact, z: number): number {
  return e.G * (e.L - z);
}

/** The duct sample: nx×ny×nz hexahedra with `velocity` (m/s, along z) and `p` (Pa), point or cell data. */
export function ductCase(o: Partial<DuctOptions> = {}): Dataset {
  const r = ductOptions(o);
  const e = ductExact(r);
  const { a, b } = e;
  // Lattice ends land exactly on the walls and the end planes.
  const mesh = hexGrid(r.nx, r.ny, r.nz, (u, v, w) => [
    u === 1 ? a : -a + 2 * a * u, v === 1 ? b : -b + 2 * b * v, w === 1 ? r.length : r.length * w,
  ]);
  const at = r.association === 'point' ? mesh.points : cellCentroids(mesh);
  const n = at.length / 3;
  const u = r.precision === 'Float32' ? new Float32Array(3 * n) : new Float64Array(3 * n);
  const p = r.precision === 'Float32' ? new Float32Array(n) : new Float64Array(n);
  for (let i = 0; i < n; i++) {
    u[3 * i + 2] = ductVelocity(e, at[3 * i]!, at[3 * i + 1]!);
    p[i] = ductPressure(e, at[3 * i + 2]!);
  }
  const fields = [field('velocity', r.association, 3, u), field('p', r.association, 1, p)];
  const piece: Piece = r.association === 'point' ? { ...mesh, pointData: fields } : { ...mesh, cellData: fields };
  validatePiece(piece, 'ductCase');
  return datasetOf([piece], `duct (${2 * a} m × ${2 * b} m, ${r.nx}×${r.ny}×${r.nz}, ${r.association} data)`);
}
