/**
 * Surface loads: the gauge pressure and the viscous traction at every corner of a set of boundary faces,
 * gathered once so that force totals, moments, Cp and distributions integrate the same numbers.
 *
 * Layout: the k-th face of `selection` (boundary face `f = selection[k]`) has corners
 * `offsets[k] .. offsets[k+1]-1`, in the node order of `faces` (outward from the fluid). Per corner:
 *  - `pressure[i]`: p − p_ref (pressure unit, Pa for SI files; ×ρ when the file stores kinematic pressure).
 *    Point data gives each corner its node value (linear on each triangle of the fan split); cell data gives
 *    every corner of a face one value: that of the file's 2D cell lying on the face when there is one (see
 *    `SurfaceGroups.faceSurfaceCell`), else of the owning 3D cell (its centre value, first order).
 *  - `traction[3i..3i+2]`: the viscous force per area the fluid exerts on the wall (pressure unit), from
 *      * a wall-shear-stress vector array (point or cell data, as above), read as the traction the fluid
 *        exerts on the wall (`wallShearSign: -1` for files storing the opposite sign), or
 *      * the velocity gradient, t = −μ(∇u + ∇uᵀ)·n with n the unit normal out of the fluid: for point
 *        velocity by default the second-order gradient at each corner node (`wallTraction.ts`, quadratic
 *        least-squares fit), or with `wallGradient: 'first-order'` the wall cell's Green–Gauss gradient,
 *        constant over each face (`wallGradient.ts`); for cell velocity t = μ u_t/d (see
 *        `gradientTraction`). μ a constant (Pa·s) or a point/cell array (node value or face-node average /
 *        owning-cell value).
 */
import { pieceOfCell, type Dataset } from '../model/dataset.ts';
import type { FieldArray, NumericArray } from '../model/fieldArray.ts';
import type { BoundaryFaces } from './boundaryFaces.ts';
import { vertexAverage } from './faceGeometry.ts';
import { cellVelocityGradient } from './wallGradient.ts';
import { wallNodeGradients } from './wallGradientCache.ts';
import { nodeTraction } from './wallTraction.ts';

/** Options of `surfaceLoads` (and of force totals). */
export interface LoadOptions {
  /** Pressure array; default: a one-component array named p / pressure / static pressure (point data first). */
  pressure: string | undefined;
  /** Reference pressure, in the stored array's unit. Default 0. */
  pRef: number;
  /** The file stores kinematic pressure p/ρ (and wall shear τ/ρ): multiply by `rho`. Default false. */
  kinematic: boolean;
  /** Density used with `kinematic` (kg/m³). */
  rho: number | undefined;
  /** Viscous part: 'auto' (wall-shear array, else gradient when velocity and μ are known, else none). Default 'auto'. */
  viscous: 'auto' | 'wall-shear' | 'gradient' | 'none';
  /** Wall-shear-stress array (3 components); default: named like skinFriction / wallShearStress / wss / tau_w. */
  wallShear: string | undefined;
  /** +1: the array is the traction the fluid exerts on the wall (default); −1: the opposite sign. */
  wallShearSign: 1 | -1;
  /** Velocity array (3 components) for the gradient; default: named velocity / U / u / vel. */
  velocity: string | undefined;
  /** Dynamic viscosity: a constant (Pa·s) or the name of a point/cell array. Needed for the gradient. */
  mu: number | string | undefined;
  /**
   * Velocity gradient at the wall for point velocity: 'second-order' (quadratic fit at each corner node,
   * default) or 'first-order' (the wall cell's linear Green–Gauss gradient).
   */
  wallGradient: 'second-order' | 'first-order';
}

export const LOAD_DEFAULTS: LoadOptions = {
  pressure: undefined, pRef: 0, kinematic: false, rho: undefined, viscous: 'auto',
  wallShear: undefined, wallShearSign: 1, velocity: undefined, mu: undefined, wallGradient: 'second-order',
};

export type ViscousMethod = 'wall-shear-array' | 'velocity-gradient' | 'none';

/**
 * Point pressure as stored: the corner value of node `j` of piece `k` is `scale × (byPiece[k][j] − shift)`, the
 * very expression `SurfaceLoads.pressure` holds, so a loop reading it gives the same bits without the gather.
 */
export interface PointPressure {
  /** The pressure array of each piece (undefined for a piece holding no selected face and no array). */
  readonly byPiece: readonly (NumericArray | undefined)[];
  /** ρ for kinematic files, else 1. */
  readonly scale: number;
  /** p_ref in the stored array's unit. */
  readonly shift: number;
}

export interface SurfaceLoads {
  readonly selection: Int32Array;
  readonly offsets: Int32Array;
  /** Gathered on first read (a pressure-only force total of point data reads `pointPressure` instead). */
  readonly pressure: Float64Array;
  /** Point data: where `pressure` comes from, for loops that read the nodes' values in place; null for cell data. */
  readonly pointPressure: PointPressure | null;
  /** Null when the viscous part is not computed (`viscous.method` 'none'). */
  readonly traction: Float64Array | null;
  readonly pressureArray: string;
  readonly pressureAssociation: 'point' | 'cell';
  readonly viscous: { method: ViscousMethod; array?: string; association?: 'point' | 'cell'; mu?: number | string; gradient?: 'second-order' | 'first-order' };
  /** Things the caller should show with the result (approximations taken, parts skipped). */
  readonly notes: string[];
}

const PRESSURE_NAME = /^(p|pressure|static[ _-]?pressure|p[ _-]?static|pres)$/i;
/** Names of a wall-shear-stress array found without being named (any case; users name their own with an option). */
export const SHEAR_NAME = /^(skin[ _-]?friction|wall[ _-]?shear[ _-]?stress(es)?|wall[ _-]?shear|wss|tau[ _-]?w(all)?)$/i;
export const VELOCITY_NAME = /^(velocity|velocities|u|vel|flow[ _-]?velocity)$/i;

/** A field present in every piece that owns a selected face, by name or pattern; point data first (exported for the pool's wall gradient, src/parallel/deriveShares.ts). */
export function findArray(d: Dataset, pieces: number[], name: string | undefined, pattern: RegExp, components: number): FieldArray[] | undefined {
  for (const assoc of ['point', 'cell'] as const) {
    const first = d.pieces[pieces[0]!]!;
    const list = assoc === 'point' ? first.pointData : first.cellData;
    const pick = list.find((f) => f.components === components && (name !== undefined ? f.name === name : pattern.test(f.name)));
    if (!pick) continue;
    const all = d.pieces.map((p) => (assoc === 'point' ? p.pointData : p.cellData).find((f) => f.name === pick.name && f.components === components));
    const missing = pieces.find((k) => !all[k]);
    if (missing !== undefined) throw new Error(`${d.source}: ${assoc} array "${pick.name}" is missing from piece ${missing}, which holds selected faces`);
    return all as FieldArray[];
  }
  return undefined;
}

function arrayList(d: Dataset): string {
  const p = d.pieces[0];
  if (!p) return 'none';
  const names = [...p.pointData.map((f) => `${f.name} (point, ${f.components})`), ...p.cellData.map((f) => `${f.name} (cell, ${f.components})`)];
  return names.join(', ') || 'none';
}

/**
 * Gathers the loads on the faces of `selection` (see the file comment).
 * @param surfaceCell per boundary face, the global number of a file 2D cell on it (from `surfaceGroups`), for cell data
 * @throws Error when no pressure array is found, an array is missing from a piece, or options conflict.
 */
export function surfaceLoads(d: Dataset, faces: BoundaryFaces, selection: Int32Array, options: Partial<LoadOptions> = {},
  surfaceCell?: Int32Array): SurfaceLoads {
  const o = { ...LOAD_DEFAULTS, ...options };
  const n = selection.length, notes: string[] = [];
  if (o.kinematic && !(o.rho !== undefined && o.rho > 0)) throw new Error('kinematic pressure needs the density: give rho > 0');
  const scale = o.kinematic ? o.rho! : 1;
  const offsets = new Int32Array(n + 1), used = new Uint8Array(d.pieces.length);
  cornerOffsets(faces.offsets, faces.piece, selection, offsets, used);
  const pieces: number[] = [];
  for (let k = 0; k < used.length; k++) if (used[k]) pieces.push(k);
  if (n === 0) {
    return { selection, offsets, pressure: new Float64Array(0), pointPressure: null, traction: null, pressureArray: o.pressure ?? '', pressureAssociation: 'point', viscous: { method: 'none' }, notes: ['no faces selected'] };
  }
  const pArr = findArray(d, pieces, o.pressure, PRESSURE_NAME, 1);
  if (!pArr) {
    throw new Error(`${d.source}: no pressure array ${o.pressure !== undefined ? `"${o.pressure}"` : '(looked for p, pressure, static pressure)'}; arrays: ${arrayList(d)}`);
  }
  const pName = pArr[pieces[0]!]!.name, pAssoc = pArr[pieces[0]!]!.association as 'point' | 'cell';
  // Point pressure is gathered per corner only when something reads it: a pressure-only force total does not.
  let pressure: Float64Array | undefined;
  const corners = (): Float64Array => pressure ??= gather(d, faces, selection, offsets, pName, pAssoc, 1, scale, o.pRef, surfaceCell);
  if (pAssoc === 'cell') corners();
  const pointPressure: PointPressure | null = pAssoc === 'point' ? { byPiece: pArr.map((a) => a?.values), scale, shift: o.pRef } : null;
  if (pAssoc === 'cell') notes.push(`pressure "${pName}" is cell data: one value per face (wall 2D cell where present, else the owning cell's centre value)`);
  if (o.kinematic) notes.push(`pressure "${pName}" read as kinematic (p/ρ) and multiplied by ρ = ${o.rho}`);

  let traction: Float64Array | null = null;
  let viscous: SurfaceLoads['viscous'] = { method: 'none' };
  const shear = o.viscous === 'auto' || o.viscous === 'wall-shear' ? findArray(d, pieces, o.wallShear, SHEAR_NAME, 3) : undefined;
  if (o.viscous === 'wall-shear' && !shear) throw new Error(`${d.source}: no wall-shear-stress array ${o.wallShear ? `"${o.wallShear}"` : '(looked for skinFriction, wallShearStress, wss, tau_w)'}; arrays: ${arrayList(d)}`);
  if (shear) {
    const assoc = shear[pieces[0]!]!.association as 'point' | 'cell';
    traction = gather(d, faces, selection, offsets, shear[pieces[0]!]!.name, assoc, 3, o.wallShearSign * scale, 0, surfaceCell);
    viscous = { method: 'wall-shear-array', array: shear[pieces[0]!]!.name, association: assoc };
    if (o.kinematic) notes.push(`wall shear "${viscous.array}" read as kinematic (τ/ρ) and multiplied by ρ`);
  } else if (o.viscous === 'auto' || o.viscous === 'gradient') {
    const vel = findArray(d, pieces, o.velocity, VELOCITY_NAME, 3);
    if (!vel || o.mu === undefined) {
      const why = !vel ? `no velocity array${o.velocity ? ` "${o.velocity}"` : ''}` : 'no viscosity μ given';
      if (o.viscous === 'gradient') throw new Error(`${d.source}: viscous force from the velocity gradient needs a velocity array and μ: ${why}`);
      notes.push(`viscous force not computed: no wall-shear array and ${why}`);
    } else {
      const assoc = vel[pieces[0]!]!.association as 'point' | 'cell';
      const second = assoc === 'point' && o.wallGradient !== 'first-order';
      traction = second ? secondOrderTraction(d, faces, selection, offsets, vel, o.mu) : gradientTraction(d, faces, selection, offsets, vel, o.mu, notes);
      viscous = { method: 'velocity-gradient', array: vel[pieces[0]!]!.name, association: assoc, mu: o.mu, gradient: second ? 'second-order' : 'first-order' };
    }
  } else notes.push('viscous force not computed (viscous: none)');
  return {
    selection, offsets, get pressure() { return corners(); }, pointPressure, traction, pressureArray: pName, pressureAssociation: pAssoc, viscous, notes,
  };
}

/** Corner offsets of the selected faces (prefix sums of their node counts) and which pieces hold them. */
function cornerOffsets(fo: Int32Array, facePiece: Int32Array, selection: Int32Array, offsets: Int32Array, used: Uint8Array): void {
  let corners = 0;
  for (let k = 0, n = selection.length; k < n; k++) {
    const f = selection[k]!;
    corners += fo[f + 1]! - fo[f]!;
    offsets[k + 1] = corners;
    used[facePiece[f]!] = 1;
  }
}

/**
 * Per-corner values `scale × (v − shift)` of an array with `nc` components. Cell data: the value of the file's
 * 2D cell on the face when that cell's piece has the array, else of the owning cell.
 */
function gather(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array, name: string,
  assoc: 'point' | 'cell', nc: number, scale: number, shift: number, surfaceCell: Int32Array | undefined): Float64Array {
  const out = new Float64Array(nc * offsets[offsets.length - 1]!);
  const byPiece = d.pieces.map((p) => (assoc === 'point' ? p.pointData : p.cellData).find((f) => f.name === name && f.components === nc)?.values);
  const fo = faces.offsets, nodes = faces.nodes, fp = faces.piece, n = selection.length;
  if (assoc === 'point') {
    for (let k = 0; k < n; k++) {
      const f = selection[k]!, a = fo[f]!, m = fo[f + 1]! - a, o = nc * offsets[k]!, v = byPiece[fp[f]!]!;
      if (nc === 1) for (let j = 0; j < m; j++) out[o + j] = scale * (v[nodes[a + j]!]! - shift);
      else for (let j = 0; j < m; j++) {
        const src = nc * nodes[a + j]!;
        for (let c = 0; c < nc; c++) out[o + nc * j + c] = scale * (v[src + c]! - shift);
      }
    }
    return out;
  }
  for (let k = 0; k < n; k++) {
    const f = selection[k]!, m = fo[f + 1]! - fo[f]!, o = nc * offsets[k]!;
    let piece = fp[f]!, cell = faces.cell[f]! - faces.cellStarts[piece]!;
    const s = surfaceCell ? surfaceCell[f]! : -1;
    if (s >= 0) {
      const k2 = pieceOfCell(faces.cellStarts, s);
      if (byPiece[k2]) { piece = k2; cell = s - faces.cellStarts[k2]!; }
    }
    const v = byPiece[piece]!;
    for (let j = 0; j < m; j++) for (let c = 0; c < nc; c++) out[o + nc * j + c] = scale * (v[nc * cell + c]! - shift);
  }
  return out;
}

/** Traction from the second-order gradient at every corner node (`wallTraction.ts`), μ a constant or an array. */
function secondOrderTraction(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array, vel: FieldArray[],
  mu: number | string): Float64Array {
  if (typeof mu === 'number' && !(mu >= 0)) throw new Error(`viscosity μ must be ≥ 0, got ${mu}`);
  // the fit at each wall node is geometry: planned once per mesh and face selection (wallGradientCache.ts)
  const G = wallNodeGradients(d, faces, selection, offsets, vel);
  if (typeof mu === 'number') return nodeTraction(faces, selection, offsets, G.nodes, G.byPiece, mu);
  const arrays = d.pieces.map((p) => p.pointData.find((f) => f.name === mu && f.components === 1) ?? p.cellData.find((f) => f.name === mu && f.components === 1));
  return nodeTraction(faces, selection, offsets, G.nodes, G.byPiece, (s, j) => {
    const f = selection[s]!, piece = faces.piece[f]!, arr = arrays[piece];
    if (!arr) throw new Error(`${d.source}: viscosity array "${mu}" is missing from piece ${piece}`);
    return arr.association === 'cell' ? arr.values[faces.cell[f]! - faces.cellStarts[piece]!]! : arr.values[faces.nodes[faces.offsets[f]! + j]!]!;
  });
}

/**
 * Viscous traction on the wall from the owning cells' velocity: t = −μ(∇u + ∇uᵀ)·n̂ per face with the
 * Green–Gauss gradient for point velocity; for cell velocity (no gradient inside one cell), t = μ u_t / d from
 * the owning cell's value, u_t its part tangential to the face and d the distance of the cell's vertex average
 * from the face plane (a stationary no-slip wall assumed; first order in d).
 */
function gradientTraction(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array, vel: FieldArray[],
  mu: number | string, notes: string[]): Float64Array {
  const out = new Float64Array(3 * offsets[offsets.length - 1]!);
  const cellVel = vel.some((a) => a && a.association === 'cell');
  if (cellVel) notes.push(`velocity "${vel.find((a) => a)!.name}" is cell data: wall traction μ·u_t/d from the owning cell's value (stationary no-slip wall assumed, first order)`);
  const muArrays = typeof mu === 'string' ? d.pieces.map((p) => p.pointData.find((f) => f.name === mu && f.components === 1) ?? p.cellData.find((f) => f.name === mu && f.components === 1)) : undefined;
  if (typeof mu === 'number' && !(mu >= 0)) throw new Error(`viscosity μ must be ≥ 0, got ${mu}`);
  const g = new Float64Array(9), cc = new Float64Array(3);
  for (let k = 0; k < selection.length; k++) {
    const f = selection[k]!, piece = faces.piece[f]!, p = d.pieces[piece]!, c = faces.cell[f]! - faces.cellStarts[piece]!;
    const a = faces.offsets[f]!, m = faces.offsets[f + 1]! - a;
    let muv: number;
    if (typeof mu === 'number') muv = mu;
    else {
      const arr = muArrays![piece];
      if (!arr) throw new Error(`${d.source}: viscosity array "${mu}" is missing from piece ${piece}`);
      if (arr.association === 'cell') muv = arr.values[c]!;
      else { muv = 0; for (let j = 0; j < m; j++) muv += arr.values[faces.nodes[a + j]!]!; muv /= m; }
    }
    const ax = faces.areaVector[3 * f]!, ay = faces.areaVector[3 * f + 1]!, az = faces.areaVector[3 * f + 2]!;
    const len = Math.sqrt(ax * ax + ay * ay + az * az);
    if (len === 0) continue;
    const nx = ax / len, ny = ay / len, nz = az / len;
    let tx: number, ty: number, tz: number;
    if (cellVel) {
      const u = vel[piece]!.values, ux = u[3 * c]!, uy = u[3 * c + 1]!, uz = u[3 * c + 2]!;
      vertexAverage(p.points, p.connectivity, p.offsets[c]!, p.offsets[c + 1]! - p.offsets[c]!, cc);
      const dist = (faces.centroid[3 * f]! - cc[0]!) * nx + (faces.centroid[3 * f + 1]! - cc[1]!) * ny + (faces.centroid[3 * f + 2]! - cc[2]!) * nz;
      if (!(dist > 0)) continue;
      const un = ux * nx + uy * ny + uz * nz, s = muv / dist;
      tx = s * (ux - un * nx); ty = s * (uy - un * ny); tz = s * (uz - un * nz);
    } else {
      cellVelocityGradient(p, c, vel[piece]!.values, g);
      // Rows of (G + Gᵀ) applied to n; G[3i+j] = ∂u_i/∂x_j.
      tx = -muv * ((2 * g[0]!) * nx + (g[1]! + g[3]!) * ny + (g[2]! + g[6]!) * nz);
      ty = -muv * ((g[3]! + g[1]!) * nx + (2 * g[4]!) * ny + (g[5]! + g[7]!) * nz);
      tz = -muv * ((g[6]! + g[2]!) * nx + (g[7]! + g[5]!) * ny + (2 * g[8]!) * nz);
    }
    for (let j = offsets[k]!; j < offsets[k + 1]!; j++) { out[3 * j] = tx; out[3 * j + 1] = ty; out[3 * j + 2] = tz; }
  }
  return out;
}
