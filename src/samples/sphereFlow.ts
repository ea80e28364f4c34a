/**
 * Exact flows past a sphere of radius a at the origin in a uniform stream U along +x, pressure
 * p∞ = 0 far away (SI units):
 *  - Stokes (creeping) flow, docs/references.md §3:
 *      u = U − (3a/4)(U/r + (U·x)x/r³) − (a³/4)(U/r³ − 3(U·x)x/r⁵),  p = −(3/2)μa(U·x)/r³;
 *    on the wall the traction is uniform, (3μ/2a)U: pressure part (3μ/2a)(U·n)n, shear part
 *    (3μ/2a)(U − (U·n)n); drag 6πμaU = 2πμaU (pressure) + 4πμaU (viscous), C_D = 24/Re.
 *  - Potential flow, docs/references.md §4: u = ∇[(U·x)(1 + a³/2r³)], p = ½ρ(U² − |u|²);
 *    on the wall Cp = 1 − (9/4)sin²θ, zero drag.
 * Hot-loop friendly: scalar arguments, results written into a caller's array.
 */

/** The parameters the solutions need. */
export interface SphereFlowParams {
  flow: 'stokes' | 'potential';
  /** Sphere radius a (m). */
  radius: number;
  /** Free-stream speed U along +x (m/s). */
  speed: number;
  /** Dynamic viscosity (Pa·s) and density (kg/m³). */
  mu: number;
  rho: number;
}

/** Velocity (m/s) at (x, y, z), written to out[at..at+2]. Inside the sphere (r < a) the formulas are continued unchanged. */
export function sphereVelocity(f: SphereFlowParams, x: number, y: number, z: number, out: { [i: number]: number }, at = 0): void {
  const a = f.radius, U = f.speed;
  const r2 = x * x + y * y + z * z, r = Math.sqrt(r2), r3 = r2 * r, r5 = r3 * r2;
  let ux: number, k: number;
  if (f.flow === 'stokes') {
    // u_i = U_i(1 − 3a/4r − a³/4r³) + U x x_i(−3a/4r³ + 3a³/4r⁵)
    ux = U * (1 - (3 * a) / (4 * r) - (a * a * a) / (4 * r3));
    k = U * x * ((-3 * a) / (4 * r3) + (3 * a * a * a) / (4 * r5));
  } else {
    ux = U * (1 + (a * a * a) / (2 * r3));
    k = U * x * ((-3 * a * a * a) / (2 * r5));
  }
  out[at] = ux + k * x; out[at + 1] = k * y; out[at + 2] = k * z;
}

/** Pressure relative to the free stream (Pa) at (x, y, z). */
export function spherePressure(f: SphereFlowParams, x: number, y: number, z: number): number {
  const r2 = x * x + y * y + z * z, r = Math.sqrt(r2);
  if (f.flow === 'stokes') return (-1.5 * f.mu * f.radius * f.speed * x) / (r2 * r);
  const u = scratch;
  sphereVelocity(f, x, y, z, u);
  return 0.5 * f.rho * (f.speed * f.speed - (u[0]! * u[0]! + u[1]! * u[1]! + u[2]! * u[2]!));
}

const scratch = new Float64Array(3);

/**
 * Wall shear stress (Pa) at the wall point in direction (x, y, z) (any length: only the direction is
 * used), written to out[at..at+2]: the tangential part of the traction the fluid exerts on the sphere,
 * (3μ/2a)(U − (U·n)n) for Stokes flow, zero for (inviscid) potential flow.
 */
export function sphereWallShear(f: SphereFlowParams, x: number, y: number, z: number, out: { [i: number]: number }, at = 0): void {
  if (f.flow !== 'stokes') { out[at] = 0; out[at + 1] = 0; out[at + 2] = 0; return; }
  const s = 1 / Math.sqrt(x * x + y * y + z * z), nx = x * s, ny = y * s, nz = z * s;
  const t = (1.5 * f.mu * f.speed) / f.radius;
  out[at] = t * (1 - nx * nx); out[at + 1] = -t * nx * ny; out[at + 2] = -t * nx * nz;
}

/**
 * Pressure coefficient (p − p∞)/(½ρU²) on the wall at polar angle θ (rad) measured from the +x axis
 * (the stream direction; the front stagnation point is θ = π): Stokes −(6/Re_D)cos θ, potential 1 − (9/4)sin²θ.
 */
export function sphereWallCp(f: SphereFlowParams, theta: number): number {
  if (f.flow === 'potential') { const s = Math.sin(theta); return 1 - 2.25 * s * s; }
  return (-1.5 * f.mu * f.speed * Math.cos(theta)) / f.radius / (0.5 * f.rho * f.speed * f.speed);
}
