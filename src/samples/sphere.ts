/**
 * Sample field: flow past a sphere at the origin in a uniform stream along +x, meshed as a spherical
 * shell of tetrahedra from the sphere (radius a) to an outer sphere, plus triangle cells on both
 * spheres. Exact solutions in `sphereFlow.ts`. Two scenarios, SI units:
 *  - `stokes` (default): a small bead settling slowly through a viscous syrup, seen from the bead
 *    (demo values of our own: a = 0.5 mm, U = 1 mm/s, μ = 1.5 Pa·s, ρ = 1300 kg/m³, Re_D ≈ 8.7e-4);
 *  - `potential`: the inviscid idealisation of a 100 mm ball in a 10 m/s air stream (ISA sea-level air,
 *    docs/references.md §10).
 */
import type { Dataset } from '../model/dataset.ts';
import { datasetOf, field } from '../model/meshBuild.ts';
import type { Piece } from '../model/piece.ts';
import { validatePiece } from '../model/validate.ts';
import { cellCentroids } from './cellMeasures.ts';
import { shellMesh } from './shellMesh.ts';
import { sphereVelocity, spherePressure, sphereWallShear, type SphereFlowParams } from './sphereFlow.ts';

export { sphereVelocity, spherePressure, sphereWallShear, sphereWallCp, type SphereFlowParams } from './sphereFlow.ts';

export interface SphereOptions extends SphereFlowParams {
  /** `stokes` or `potential`. Default `stokes`. Other defaults depend on it (see STOKES_DEFAULTS, POTENTIAL_DEFAULTS). */
  flow: 'stokes' | 'potential';
  /** Outer radius of the meshed shell (m). Default 5 × radius. */
  outerRadius: number;
  /** Mesh level: divisions = 3·2^refinement per icosahedron edge, so each level halves the edge length. Default 1. */
  refinement: number;
  /** Overrides the divisions per icosahedron edge (any positive integer, for refinement ratios other than 2). */
  divisions?: number;
  /** Overrides the cell layers through the shell (default: as many as keep the cells about as thick as wide). */
  layers?: number;
  /** Fields as point data or cell data. `group` is always cell data. Default `point`. */
  association: 'point' | 'cell';
  /** Element type of velocity, p and skinFriction (the wall shear stress vector). Default `Float64`. */
  precision: 'Float64' | 'Float32';
}

/** Stokes defaults: a bead in syrup (demo values). */
export const STOKES_DEFAULTS = { radius: 0.5e-3, speed: 1e-3, mu: 1.5, rho: 1300 } as const;
/** Potential-flow defaults: a 100 mm ball in air at 10 m/s; μ and ρ of ISA sea-level air (docs/references.md §10). */
export const POTENTIAL_DEFAULTS = { radius: 0.05, speed: 10, mu: 1.7894e-5, rho: 1.225 } as const;

/** Cell groups of the `group` cell array. */
export const SPHERE_GROUPS = { volume: 0, wall: 1, outer: 2 } as const;

/** Full options from partial ones, checked. */
export function sphereOptions(o: Partial<SphereOptions> = {}): SphereOptions & { divisions: number; layers: number } {
  const flow = o.flow ?? 'stokes';
  const base = { ...(flow === 'stokes' ? STOKES_DEFAULTS : POTENTIAL_DEFAULTS), flow, refinement: 1, association: 'point' as const, precision: 'Float64' as const };
  const r = { ...base, ...o };
  const outerRadius = o.outerRadius ?? 5 * r.radius;
  for (const k of ['radius', 'speed', 'mu', 'rho'] as const) {
    if (!(r[k] > 0) || !Number.isFinite(r[k])) throw new Error(`sphereCase: ${k} must be a positive number, got ${r[k]}`);
  }
  if (!(outerRadius > r.radius)) throw new Error(`sphereCase: outerRadius ${outerRadius} must exceed the radius ${r.radius}`);
  if (!Number.isInteger(r.refinement) || r.refinement < 0 || r.refinement > 6) throw new Error(`sphereCase: refinement must be an integer 0…6, got ${r.refinement}`);
  const divisions = o.divisions ?? 3 * 2 ** r.refinement;
  // Layers so that a layer is about as thick as a surface edge (about 1.107/divisions radians) is long.
  const layers = o.layers ?? Math.max(1, Math.ceil((divisions * Math.log(outerRadius / r.radius)) / Math.atan(2)));
  for (const [k, v] of [['divisions', divisions], ['layers', layers]] as const) {
    if (!Number.isInteger(v) || v < 1) throw new Error(`sphereCase: ${k} must be a positive integer, got ${v}`);
  }
  return { ...r, outerRadius, divisions, layers };
}

/** Exact values (docs/references.md §3 Stokes, §4 potential). Forces in N along +x, on the sphere. */
export interface SphereExact {
  flow: 'stokes' | 'potential';
  /** Radius a (m), outer radius (m), speed U (m/s), viscosity (Pa·s), density (kg/m³). */
  a: number; outerRadius: number; U: number; mu: number; rho: number;
  /** Reynolds number ρU·2a/μ. */
  Re: number;
  /** Frontal (reference) area πa² (m²) and dynamic pressure ½ρU² (Pa). */
  frontalArea: number; dynamicPressure: number;
  /** Drag (N): total, pressure part, viscous part. Stokes 6πμaU = 2πμaU + 4πμaU; potential 0. */
  dragTotal: number; dragPressure: number; dragViscous: number;
  /** Drag coefficients on πa² and ½ρU² (Stokes: 24/Re, 8/Re, 16/Re). */
  CD: number; CDPressure: number; CDViscous: number;
  /** Largest wall shear stress (Pa): 3μU/2a at the equator (Stokes), 0 (potential). */
  wallShearMax: number;
  /** Wall pressure coefficient at the front stagnation point and its minimum (at the equator for potential flow). */
  cpStagnation: number; cpMin: number;
  /** Volume of the meshed shell (m³), 4π(R_o³ − a³)/3. */
  shellVolume: number;
}

/** The exact solution's numbers for the given options. */
export function sphereExact(o: Partial<SphereOptions> = {}): SphereExact {
  const r = sphereOptions(o);
  const { radius: a, speed: U, mu, rho, outerRadius } = r;
  const q = 0.5 * rho * U * U, A = Math.PI * a * a, stokes = r.flow === 'stokes';
  const dragPressure = stokes ? 2 * Math.PI * mu * a * U : 0, dragViscous = stokes ? 4 * Math.PI * mu * a * U : 0;
  return {
    flow: r.flow, a, outerRadius, U, mu, rho, Re: (rho * U * 2 * a) / mu, frontalArea: A, dynamicPressure: q,
    dragTotal: dragPressure + dragViscous, dragPressure, dragViscous,
    CD: (dragPressure + dragViscous) / (q * A), CDPressure: dragPressure / (q * A), CDViscous: dragViscous / (q * A),
    wallShearMax: stokes ? (1.5 * mu * U) / a : 0,
    cpStagnation: stokes ? (1.5 * mu * U) / a / q : 1,
    cpMin: stokes ? (-1.5 * mu * U) / a / q : -1.25,
    shellVolume: (4 / 3) * Math.PI * (outerRadius ** 3 - a ** 3),
  };
}

/**
 * The sphere sample: tetrahedra in the shell, then triangles on the sphere wall, then triangles on the
 * outer sphere, with the Int32 cell array `group` (0 volume, 1 wall, 2 outer). Boundary triangles face
 * out of the fluid (into the sphere on the wall). Fields `velocity` (m/s), `p` (Pa, p∞ = 0),
 * `skinFriction` (Pa; nonzero only on the wall): at nodes, or at cell centroids — for boundary
 * triangles, at the centroid moved radially onto their sphere.
 */
export function sphereCase(o: Partial<SphereOptions> = {}): Dataset {
  const r = sphereOptions(o);
  const shell = shellMesh(r.radius, r.outerRadius, r.divisions, r.layers);
  const mesh = shell.piece, nTet = shell.tetrahedra, nWall = shell.innerTriangles;
  const cell = r.association === 'cell';
  const at = cell ? cellCentroids(mesh) : mesh.points;
  const n = at.length / 3;
  // Sample sites on the wall: the first pointsPerSphere points, or the wall triangles.
  const onWall = (i: number) => (cell ? i >= nTet && i < nTet + nWall : i < shell.pointsPerSphere);
  const onOuter = (i: number) => cell && i >= nTet + nWall;
  const F = r.precision === 'Float32' ? Float32Array : Float64Array;
  const u = new F(3 * n), p = new F(n), tau = new F(3 * n), tmp = new Float64Array(3);
  for (let i = 0; i < n; i++) {
    let x = at[3 * i]!, y = at[3 * i + 1]!, z = at[3 * i + 2]!;
    const wall = onWall(i);
    if (cell && (wall || onOuter(i))) {
      const s = (wall ? r.radius : r.outerRadius) / Math.hypot(x, y, z);
      x *= s; y *= s; z *= s;
    }
    sphereVelocity(r, x, y, z, tmp);
    // No slip holds exactly on the Stokes wall; the formula leaves rounding there.
    if (wall && r.flow === 'stokes') tmp.fill(0);
    u[3 * i] = tmp[0]!; u[3 * i + 1] = tmp[1]!; u[3 * i + 2] = tmp[2]!;
    p[i] = spherePressure(r, x, y, z);
    if (wall) { sphereWallShear(r, x, y, z, tmp); tau[3 * i] = tmp[0]!; tau[3 * i + 1] = tmp[1]!; tau[3 * i + 2] = tmp[2]!; }
  }
  const group = new Int32Array(mesh.cellTypes.length);
  group.fill(SPHERE_GROUPS.wall, nTet, nTet + nWall).fill(SPHERE_GROUPS.outer, nTet + nWall);
  const fields = [field('velocity', r.association, 3, u), field('p', r.association, 1, p), field('skinFriction', r.association, 3, tau)];
  const groupField = { ...field('group', 'cell', 1, group), sourceType: 'Int32' };
  const piece: Piece = cell
    ? { ...mesh, cellData: [...fields, groupField] }
    : { ...mesh, pointData: fields, cellData: [groupField] };
  validatePiece(piece, 'sphereCase');
  return datasetOf([piece], `sphere (${r.flow}, ${r.divisions} divisions, ${r.layers} layers, ${r.association} data)`);
}
