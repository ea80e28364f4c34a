/**
 * Force totals on a set of boundary faces: pressure and viscous force, moment, coefficients, centre of
 * pressure, and the surface pressure coefficient.
 *
 * Sign convention: the force is the force the fluid exerts ON the wall (on whatever lies outside the fluid
 * domain across the faces, e.g. a body). Boundary faces are oriented outward from the fluid, i.e. into the
 * body, n = −n_body, so
 *     F_pressure = −∫ (p − p_ref) n_body dA = ∫ (p − p_ref) n dA,
 *     F_viscous  = ∫ τ_w dA   (τ_w the viscous traction on the wall; = ∫ τ·n_body dA = −∫ μ(∇u+∇uᵀ)·n dA),
 *     M = ∫ (x − x_ref) × dF.
 * Integration is exact for point data linear on each triangle of the faces' fan split: ∫ p n dA uses the
 * triangle's mean corner value (exact for linear × constant normal), the moment the three edge midpoints
 * (exact for the quadratic x·p). Units: force = pressure unit × length unit² (N for Pa and m), moment N·m.
 *
 * Coefficients use q = ½ ρ U² and the reference area A (and length L for moments): C = F·e / (q A) along the
 * drag direction d, the lift direction l (made orthogonal to d) and the side direction s = l × d, so that
 * (d, s, l) is right-handed (drag x, lift z → side +y); moment coefficients M·e / (q A L) about the same axes.
 */
import type { Dataset } from '../model/dataset.ts';
import type { BoundaryFaces } from './boundaryFaces.ts';
import { integratePressureTriangles } from './pressureForceLoop.ts';
import type { SurfaceLoads } from './surfaceLoads.ts';

export type Vec3 = [number, number, number];

/** Reference values for coefficients. */
export interface ForceReference {
  /** Density ρ (kg/m³). */
  rho: number;
  /** Speed U (m/s). */
  speed: number;
  /** Reference area A (length unit²). */
  area: number;
  /** Reference length L for moment coefficients (length unit); moment coefficients are null without it. */
  length?: number;
}

/** Options of `forceTotals`. */
export interface ForceOptions {
  /** Point the moment is taken about (length unit). Default origin. */
  momentPoint: Vec3;
  /** Drag direction (normalised). Default +x. */
  dragDirection: Vec3;
  /** Lift direction (its part along the drag direction is removed). Default +z. */
  liftDirection: Vec3;
  /** Axis along which the centre of pressure is given. Default: the drag direction. */
  cpAxis: Vec3 | undefined;
  /** Reference values; coefficients are null without them. */
  reference: ForceReference | undefined;
}

export const FORCE_DEFAULTS: ForceOptions = {
  momentPoint: [0, 0, 0], dragDirection: [1, 0, 0], liftDirection: [0, 0, 1], cpAxis: undefined, reference: undefined,
};

export interface AxisParts { drag: number; lift: number; side: number }

export interface ForceResult {
  faces: number;
  /** Wetted area Σ|A_f| (length unit²). */
  area: number;
  pressureForce: Vec3;
  /** Null when the viscous part was not computed (see `viscous.method` and `notes`). */
  viscousForce: Vec3 | null;
  force: Vec3;
  pressureMoment: Vec3;
  viscousMoment: Vec3 | null;
  moment: Vec3;
  momentPoint: Vec3;
  directions: { drag: Vec3; lift: Vec3; side: Vec3 };
  /** Force components along the directions (force unit). */
  /**
   * Σ|dF| over the faces (pressure unit × length unit²): the force's size with nothing cancelling. A net
   * component far below it (≤ 10⁻⁹ of it) is rounding noise of the sum, e.g. any component of a closed
   * body's force in a uniform pressure.
   */
  grossForce: number;
  components: { total: AxisParts; pressure: AxisParts; viscous: AxisParts | null };
  coefficients: null | {
    drag: number; lift: number; side: number;
    pressure: AxisParts; viscous: AxisParts | null;
    /** About the drag, side and lift axes through the moment point; null without a reference length. */
    moment: { aboutDrag: number; aboutSide: number; aboutLift: number } | null;
    dynamicPressure: number;
    reference: ForceReference;
  };
  /** Point on the axis through the moment point closest to the line of action of the pressure force. */
  centreOfPressure: { axis: Vec3; offset: number; position: Vec3 } | null;
  pressureArray: string;
  viscous: SurfaceLoads['viscous'];
  signConvention: string;
  units: string;
  notes: string[];
}

export const SIGN_CONVENTION = 'Force exerted by the fluid on the wall (on the body): F = ∫(p − p_ref)(−n_body) dA + ∫τ_w dA, '
  + 'n_body the unit normal out of the body into the fluid; moment M = ∫(x − x_ref) × dF.';
export const UNITS_NOTE = 'Forces in pressure unit × length unit² (N for Pa and m), moments × length unit (N·m); '
  + 'coefficients dimensionless with q = ½ρU².';

const unit = (v: Vec3): Vec3 => { const l = Math.hypot(v[0], v[1], v[2]); return [v[0] / l, v[1] / l, v[2] / l]; };
const dot = (a: Vec3, b: Vec3): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const cross = (a: Vec3, b: Vec3): Vec3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];

/** Unit drag, lift (orthogonalised against drag) and side (= lift × drag) directions. */
export function forceDirections(drag: Vec3, lift: Vec3): { drag: Vec3; lift: Vec3; side: Vec3; adjusted: boolean } {
  if (!(Math.hypot(...drag) > 0)) throw new Error('drag direction must be a non-zero vector');
  const d = unit(drag), k = dot(lift, d);
  const l0: Vec3 = [lift[0] - k * d[0], lift[1] - k * d[1], lift[2] - k * d[2]];
  if (!(Math.hypot(...l0) > 1e-12 * Math.hypot(...lift))) throw new Error('lift direction must not be parallel to the drag direction');
  const l = unit(l0);
  return { drag: d, lift: l, side: cross(l, d), adjusted: Math.abs(k) > 1e-9 * Math.hypot(...lift) };
}

/**
 * Running sums of the integration: pressure F, M (0..5), viscous F, M (6..11), the wetted area (12) and
 * Σ|dF| (13), carried from one chunk of faces to the next.
 */
const acc = new Float64Array(14);

/** Faces per call of `integrateFaces`. */
const CHUNK = 64;

/**
 * Integrates pressure (and traction when present) over the selected faces into `acc[0..5]` (pressure F, M),
 * `acc[6..11]` (viscous F, M), `acc[12]` (Σ|A_f|) and `acc[13]` (Σ|dF| over the fan triangles). The faces go in calls of CHUNK carrying the running
 * sums, so the engine optimises the face loop as a whole function with feedback for every line of it (a
 * single loop over every face ran its first call half unoptimised: the optimised loop was thrown away at
 * the stores after it); the additions are the same, in the same order.
 */
function integrate(d: Dataset, faces: BoundaryFaces, loads: SurfaceLoads, ref: Vec3): void {
  // No viscous part, point pressure, triangles only: the loop of pressureForceLoop.ts, same bits with no traction work.
  const n = loads.selection.length;
  if (!loads.traction && loads.pointPressure && loads.offsets[n] === 3 * n) { integratePressureTriangles(d, faces, loads.selection, loads.pointPressure, ref, acc); return; }
  acc.fill(0);
  for (let k = 0; k < n; k += CHUNK) integrateFaces(d, faces, loads, ref, k, Math.min(n, k + CHUNK));
}

/** The faces k0 … k1 − 1 of the selection, added to the running sums in `acc`. */
function integrateFaces(d: Dataset, faces: BoundaryFaces, loads: SurfaceLoads, ref: Vec3, k0: number, k1: number): void {
  const sel = loads.selection, off = loads.offsets, P = loads.pressure, T = loads.traction;
  const rx = ref[0], ry = ref[1], rz = ref[2];
  let fpx = acc[0]!, fpy = acc[1]!, fpz = acc[2]!, mpx = acc[3]!, mpy = acc[4]!, mpz = acc[5]!;
  let fvx = acc[6]!, fvy = acc[7]!, fvz = acc[8]!, mvx = acc[9]!, mvy = acc[10]!, mvz = acc[11]!, wetted = acc[12]!, gross = acc[13]!;
  const fo = faces.offsets, nodes = faces.nodes, fp = faces.piece, pieces = d.pieces, av = faces.areaVector;
  for (let k = k0; k < k1; k++) {
    const f = sel[k]!, a = fo[f]!, m = fo[f + 1]! - a, o = off[k]!;
    const pts = pieces[fp[f]!]!.points;
    const avx = av[3 * f]!, avy = av[3 * f + 1]!, avz = av[3 * f + 2]!;
    wetted += Math.sqrt(avx * avx + avy * avy + avz * avz);
    // Fan centre (vertex average) and its values, used when m > 3.
    let cx = 0, cy = 0, cz = 0, cp = 0, ctx = 0, cty = 0, ctz = 0;
    if (m > 3) {
      for (let j = 0; j < m; j++) {
        const q = 3 * nodes[a + j]!;
        cx += pts[q]!; cy += pts[q + 1]!; cz += pts[q + 2]!; cp += P[o + j]!;
        if (T) { ctx += T[3 * (o + j)]!; cty += T[3 * (o + j) + 1]!; ctz += T[3 * (o + j) + 2]!; }
      }
      cx /= m; cy /= m; cz /= m; cp /= m; ctx /= m; cty /= m; ctz /= m;
    }
    const tris = m === 3 ? 1 : m;
    for (let t = 0; t < tris; t++) {
      let x0: number, y0: number, z0: number, p0: number, t0x = 0, t0y = 0, t0z = 0, i1: number, i2: number;
      if (m === 3) {
        const q = 3 * nodes[a]!;
        x0 = pts[q]!; y0 = pts[q + 1]!; z0 = pts[q + 2]!; p0 = P[o]!;
        if (T) { t0x = T[3 * o]!; t0y = T[3 * o + 1]!; t0z = T[3 * o + 2]!; }
        i1 = 1; i2 = 2;
      } else {
        x0 = cx; y0 = cy; z0 = cz; p0 = cp; t0x = ctx; t0y = cty; t0z = ctz;
        i1 = t; i2 = t + 1 === m ? 0 : t + 1;
      }
      const q1 = 3 * nodes[a + i1]!, q2 = 3 * nodes[a + i2]!;
      const x1 = pts[q1]!, y1 = pts[q1 + 1]!, z1 = pts[q1 + 2]!, x2 = pts[q2]!, y2 = pts[q2 + 1]!, z2 = pts[q2 + 2]!;
      const p1 = P[o + i1]!, p2 = P[o + i2]!;
      const ux = x1 - x0, uy = y1 - y0, uz = z1 - z0, vx = x2 - x0, vy = y2 - y0, vz = z2 - z0;
      const sx = 0.5 * (uy * vz - uz * vy), sy = 0.5 * (uz * vx - ux * vz), sz = 0.5 * (ux * vy - uy * vx);
      const pm = (p0 + p1 + p2) / 3;
      fpx += pm * sx; fpy += pm * sy; fpz += pm * sz;
      const area = Math.sqrt(sx * sx + sy * sy + sz * sz);
      gross += Math.abs(pm) * area;
      // Edge midpoints (relative to the moment point) and their pressures: exact for the quadratic x·p.
      const m0x = 0.5 * (x0 + x1) - rx, m0y = 0.5 * (y0 + y1) - ry, m0z = 0.5 * (z0 + z1) - rz, pa = 0.5 * (p0 + p1);
      const m1x = 0.5 * (x1 + x2) - rx, m1y = 0.5 * (y1 + y2) - ry, m1z = 0.5 * (z1 + z2) - rz, pb = 0.5 * (p1 + p2);
      const m2x = 0.5 * (x2 + x0) - rx, m2y = 0.5 * (y2 + y0) - ry, m2z = 0.5 * (z2 + z0) - rz, pc = 0.5 * (p2 + p0);
      // Σ (m_i p_i) × S / 3
      const wx = (m0x * pa + m1x * pb + m2x * pc) / 3, wy = (m0y * pa + m1y * pb + m2y * pc) / 3, wz = (m0z * pa + m1z * pb + m2z * pc) / 3;
      mpx += wy * sz - wz * sy; mpy += wz * sx - wx * sz; mpz += wx * sy - wy * sx;
      if (T) {
        const j1 = 3 * (o + i1), j2 = 3 * (o + i2);
        const t1x = T[j1]!, t1y = T[j1 + 1]!, t1z = T[j1 + 2]!, t2x = T[j2]!, t2y = T[j2 + 1]!, t2z = T[j2 + 2]!;
        const tx = t0x + t1x + t2x, ty = t0y + t1y + t2y, tz = t0z + t1z + t2z;
        fvx += area * tx / 3; fvy += area * ty / 3; fvz += area * tz / 3;
        gross += area * Math.sqrt(tx * tx + ty * ty + tz * tz) / 3;
        // Moment of the traction: Σ over midpoints of m_i × t_i, times area / 3.
        const ax = 0.5 * (t0x + t1x), ay = 0.5 * (t0y + t1y), az = 0.5 * (t0z + t1z);
        const bx = 0.5 * (t1x + t2x), by = 0.5 * (t1y + t2y), bz = 0.5 * (t1z + t2z);
        const ex = 0.5 * (t2x + t0x), ey = 0.5 * (t2y + t0y), ez = 0.5 * (t2z + t0z);
        const w = area / 3;
        mvx += w * (m0y * az - m0z * ay + m1y * bz - m1z * by + m2y * ez - m2z * ey);
        mvy += w * (m0z * ax - m0x * az + m1z * bx - m1x * bz + m2z * ex - m2x * ez);
        mvz += w * (m0x * ay - m0y * ax + m1x * by - m1y * bx + m2x * ey - m2y * ex);
      }
    }
  }
  acc[0] = fpx; acc[1] = fpy; acc[2] = fpz; acc[3] = mpx; acc[4] = mpy; acc[5] = mpz;
  acc[6] = fvx; acc[7] = fvy; acc[8] = fvz; acc[9] = mvx; acc[10] = mvy; acc[11] = mvz; acc[12] = wetted; acc[13] = gross;
}

const along = (v: Vec3, dirs: { drag: Vec3; lift: Vec3; side: Vec3 }): AxisParts => ({ drag: dot(v, dirs.drag), lift: dot(v, dirs.lift), side: dot(v, dirs.side) });

/**
 * Force totals over the faces of `loads` (from `surfaceLoads`). `d` is the dataset the faces came from.
 * @throws Error for a zero drag direction, a lift direction parallel to it, or non-positive reference values.
 */
export function forceTotals(d: Dataset, faces: BoundaryFaces, loads: SurfaceLoads,
  options: Partial<ForceOptions> = {}): ForceResult {
  const o = { ...FORCE_DEFAULTS, ...options };
  const dirs = forceDirections(o.dragDirection, o.liftDirection);
  const notes = [...loads.notes];
  if (dirs.adjusted) notes.push('lift direction was not orthogonal to the drag direction; its drag-direction part was removed');
  const ref = o.reference;
  if (ref && !(ref.rho > 0 && ref.speed > 0 && ref.area > 0 && (ref.length === undefined || ref.length > 0))) {
    throw new Error(`reference values must be positive: rho ${ref.rho}, speed ${ref.speed}, area ${ref.area}${ref.length !== undefined ? `, length ${ref.length}` : ''}`);
  }
  integrate(d, faces, loads, o.momentPoint);
  const Fp: Vec3 = [acc[0]!, acc[1]!, acc[2]!], Mp: Vec3 = [acc[3]!, acc[4]!, acc[5]!];
  const hasV = loads.traction !== null;
  const Fv: Vec3 | null = hasV ? [acc[6]!, acc[7]!, acc[8]!] : null, Mv: Vec3 | null = hasV ? [acc[9]!, acc[10]!, acc[11]!] : null;
  const F: Vec3 = Fv ? [Fp[0] + Fv[0], Fp[1] + Fv[1], Fp[2] + Fv[2]] : Fp;
  const M: Vec3 = Mv ? [Mp[0] + Mv[0], Mp[1] + Mv[1], Mp[2] + Mv[2]] : Mp;
  const area = acc[12]!;
  const components = { total: along(F, dirs), pressure: along(Fp, dirs), viscous: Fv ? along(Fv, dirs) : null };
  let coefficients: ForceResult['coefficients'] = null;
  if (ref) {
    const q = 0.5 * ref.rho * ref.speed * ref.speed, qa = q * ref.area;
    const scale = (p: AxisParts): AxisParts => ({ drag: p.drag / qa, lift: p.lift / qa, side: p.side / qa });
    const ql = ref.length !== undefined ? qa * ref.length : undefined;
    coefficients = {
      drag: components.total.drag / qa, lift: components.total.lift / qa, side: components.total.side / qa,
      pressure: scale(components.pressure), viscous: components.viscous ? scale(components.viscous) : null,
      moment: ql ? { aboutDrag: dot(M, dirs.drag) / ql, aboutSide: dot(M, dirs.side) / ql, aboutLift: dot(M, dirs.lift) / ql } : null,
      dynamicPressure: q, reference: { ...ref },
    };
  } else notes.push('coefficients not computed: give the reference density, speed and area');
  const axis = unit(o.cpAxis ?? dirs.drag);
  const axf = cross(axis, Fp), axf2 = dot(axf, axf);
  let centreOfPressure: ForceResult['centreOfPressure'] = null;
  if (axf2 > 1e-24 * dot(Fp, Fp) && axf2 > 0) {
    const s = dot(Mp, axf) / axf2;
    centreOfPressure = { axis, offset: s, position: [o.momentPoint[0] + s * axis[0], o.momentPoint[1] + s * axis[1], o.momentPoint[2] + s * axis[2]] };
  } else notes.push('centre of pressure undefined: the pressure force is zero or parallel to the axis');
  return {
    faces: loads.selection.length, area, pressureForce: Fp, viscousForce: Fv, force: F, pressureMoment: Mp, viscousMoment: Mv,
    moment: M, momentPoint: [...o.momentPoint], directions: { drag: dirs.drag, lift: dirs.lift, side: dirs.side },
    grossForce: acc[13]!, components, coefficients, centreOfPressure, pressureArray: loads.pressureArray, viscous: loads.viscous,
    signConvention: SIGN_CONVENTION, units: UNITS_NOTE, notes,
  };
}

/**
 * Pressure coefficient Cp = (p − p_ref)/(½ρU²) on the faces of `loads`, for colouring: per corner (aligned
 * with `loads.offsets`) and per face (the face's area-weighted mean over its fan triangles). `min`/`max` over
 * the corners. The pressure in `loads` is already gauge (and dimensional for kinematic files).
 */
export function pressureCoefficient(d: Dataset, faces: BoundaryFaces, loads: SurfaceLoads,
  rho: number, speed: number): { perCorner: Float64Array; perFace: Float64Array; min: number; max: number } {
  if (!(rho > 0 && speed > 0)) throw new Error(`Cp needs positive reference density and speed, got rho ${rho}, speed ${speed}`);
  const q = 0.5 * rho * speed * speed, P = loads.pressure;
  const perCorner = new Float64Array(P.length);
  let min = Infinity, max = -Infinity;
  for (let i = 0; i < P.length; i++) { const c = P[i]! / q; perCorner[i] = c; if (c < min) min = c; if (c > max) max = c; }
  const perFace = new Float64Array(loads.selection.length);
  for (let k = 0; k < loads.selection.length; k++) {
    const f = loads.selection[k]!, a = faces.offsets[f]!, m = faces.offsets[f + 1]! - a, o = loads.offsets[k]!;
    const pts = d.pieces[faces.piece[f]!]!.points;
    if (m === 3) { perFace[k] = (perCorner[o]! + perCorner[o + 1]! + perCorner[o + 2]!) / 3; continue; }
    // Fan triangles around the vertex average, each with its mean corner value, weighted by area.
    let cx = 0, cy = 0, cz = 0, cc = 0;
    for (let j = 0; j < m; j++) { const q3 = 3 * faces.nodes[a + j]!; cx += pts[q3]!; cy += pts[q3 + 1]!; cz += pts[q3 + 2]!; cc += perCorner[o + j]!; }
    cx /= m; cy /= m; cz /= m; cc /= m;
    let sw = 0, s = 0;
    for (let j = 0; j < m; j++) {
      const j2 = j + 1 === m ? 0 : j + 1, q1 = 3 * faces.nodes[a + j]!, q2 = 3 * faces.nodes[a + j2]!;
      const ux = pts[q1]! - cx, uy = pts[q1 + 1]! - cy, uz = pts[q1 + 2]! - cz, vx = pts[q2]! - cx, vy = pts[q2 + 1]! - cy, vz = pts[q2 + 2]! - cz;
      const wx = uy * vz - uz * vy, wy = uz * vx - ux * vz, wz = ux * vy - uy * vx, w = Math.sqrt(wx * wx + wy * wy + wz * wz);
      sw += w; s += w * (cc + perCorner[o + j]! + perCorner[o + j2]!) / 3;
    }
    perFace[k] = sw > 0 ? s / sw : cc;
  }
  return { perCorner, perFace, min: P.length ? min : NaN, max: P.length ? max : NaN };
}
