/**
 * Sample series: the decaying vortex lattice of a thin layer of water in a square shaken tray cell —
 * the Taylor–Green vortex, an exact solution of the incompressible Navier–Stokes equations
 * (Taylor & Green 1937, "Mechanism of the production of small eddies from large ones", Proc. R. Soc.
 * Lond. A 158, 499–521; its two-dimensional decaying form, which tests/samples/taylorGreen.test.ts checks
 * against the Navier–Stokes equations by their residual):
 *
 *   u =  U sin(kx) cos(ky) e^{−2νk²t},   v = −U cos(kx) sin(ky) e^{−2νk²t},   w = 0,
 *   p = (ρU²/4) (cos 2kx + cos 2ky) e^{−4νk²t}   (gauge pressure, mean zero),
 *
 * on the cell 0 ≤ x, y ≤ L with k = 2π/L, extruded by a thickness H in z (one layer of hexahedra).
 * Velocities decay at the rate 2νk², pressure and kinetic energy at 4νk².
 */
import type { Dataset } from '../model/dataset.ts';
import { datasetOf, field, hexGrid } from '../model/meshBuild.ts';
import type { Piece } from '../model/piece.ts';

/** Parameters of the vortex cell, SI. */
export interface VortexOptions {
  /** Side L of the square cell (m): one period of the lattice. Default 0.01. */
  side: number;
  /** Layer thickness H (m). Default 0.002. */
  thickness: number;
  /** Velocity scale U (m/s). Default 0.01. */
  speed: number;
  /** Kinematic viscosity ν (m²/s). Default 1.0e-6 (water near 20 °C, rounded). */
  nu: number;
  /** Density ρ (kg/m³). Default 1000 (rounded water). */
  rho: number;
  /** Hexahedra along x and along y. Default 16. */
  cells: number;
}

export const VORTEX_DEFAULTS: Readonly<VortexOptions> = { side: 0.01, thickness: 0.002, speed: 0.01, nu: 1.0e-6, rho: 1000, cells: 16 };

/** Uneven step times of the committed series (s). */
export const VORTEX_TIMES: readonly number[] = [0, 0.05, 0.15, 0.3, 0.5, 0.8, 1.2, 1.7];

/** Wavenumber k = 2π/L (1/m). */
export const wavenumber = (o: VortexOptions): number => (2 * Math.PI) / o.side;

/** Velocity decay rate 2νk² (1/s); pressure decays at twice this. */
export const velocityDecayRate = (o: VortexOptions): number => 2 * o.nu * wavenumber(o) ** 2;

/** Exact velocity (m/s) at (x, y) and time t (s). */
export function exactVelocity(o: VortexOptions, x: number, y: number, t: number): [number, number, number] {
  const k = wavenumber(o), f = o.speed * Math.exp(-velocityDecayRate(o) * t);
  return [f * Math.sin(k * x) * Math.cos(k * y), -f * Math.cos(k * x) * Math.sin(k * y), 0];
}

/** Exact gauge pressure (Pa) at (x, y) and time t (s). */
export function exactPressure(o: VortexOptions, x: number, y: number, t: number): number {
  const k = wavenumber(o);
  return 0.25 * o.rho * o.speed ** 2 * (Math.cos(2 * k * x) + Math.cos(2 * k * y)) * Math.exp(-2 * velocityDecayRate(o) * t);
}

/** The mesh of the cell (shared by every step). */
export function vortexMesh(o: VortexOptions = VORTEX_DEFAULTS): Piece {
  return hexGrid(o.cells, o.cells, 1, (u, v, w) => [u * o.side, v * o.side, w * o.thickness]);
}

/** The flow at time t (s) on `mesh`: point fields `velocity` (m/s) and `p` (Pa), field data `TimeValue` (s). */
export function vortexStep(t: number, o: VortexOptions = VORTEX_DEFAULTS, mesh: Piece = vortexMesh(o), source = `vortex cell t=${t}`): Dataset {
  const n = mesh.points.length / 3;
  const vel = new Float64Array(3 * n), p = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const x = mesh.points[3 * i]!, y = mesh.points[3 * i + 1]!;
    const u = exactVelocity(o, x, y, t);
    vel[3 * i] = u[0]; vel[3 * i + 1] = u[1]; vel[3 * i + 2] = u[2];
    p[i] = exactPressure(o, x, y, t);
  }
  const d = datasetOf([{ ...mesh, pointData: [field('velocity', 'point', 3, vel), field('p', 'point', 1, p)], cellData: [] }], source);
  return { ...d, fieldData: [{ name: 'TimeValue', association: 'dataset', components: 1, values: Float64Array.of(t), sourceType: 'Float64' }] };
}
