/**
 * Boundary-layer quantities from a wall-normal line probe. The line's start A is taken as the wall
 * (s = 0) and must lie in the mesh; the profile is the run of valid samples from A up to the first gap.
 *
 * Velocity along the profile, u(s): the probed field's component along `direction` when given; otherwise,
 * for a vector, the magnitude of its part normal to the line (the part parallel to the wall); a scalar
 * field is used as it is.
 *
 * Edge (U_e, s_e), two criteria (both common practice):
 *  - `max` (default): U_e is the largest u on the profile and s_e where it occurs — for profiles that
 *    rise monotonically to the free stream, without an overshoot;
 *  - `gradient`: s_e is the first sample after the wall where |du/ds| (finite difference between
 *    neighbouring samples) falls below `gradientFraction` (default 0.1 %) of its value at the wall, and
 *    U_e = u(s_e).
 * Then δ99 is the first s where u reaches 0.99 U_e (linear between samples), and, from the wall to s_e,
 *   δ* = ∫ (1 − u/U_e) ds,  θ = ∫ (u/U_e)(1 − u/U_e) ds,  H = δ* ÷ θ.
 * The integrals are exact for u varying linearly between samples (what interpolation gives along a
 * crossing-sampled line in straight-sided cells): the trapezoid rule for δ*, and for θ
 * h·[(a₀+a₁)/2 − (a₀² + a₀a₁ + a₁²)/3] per stretch with a = u/U_e. Lengths in the file's length unit,
 * U_e in the field's unit.
 */
import type { LineProbeResult, Vec3 } from './lineProbe.ts';

export interface BoundaryLayerOptions {
  /** Name of the sampled velocity field (vector or scalar). Default `velocity`. */
  field: string;
  /** Project the velocity on this direction (need not be unit). Default: none (magnitude of the wall-parallel part). */
  direction?: Vec3;
  /** Edge criterion. Default `max`. */
  edge: 'max' | 'gradient';
  /** For `gradient`: fraction of the wall gradient that marks the edge. Default 0.001 (at 0.01 the Blasius edge falls at u ≈ 0.997 U and δ* comes out about 1 % low). */
  gradientFraction: number;
}

export const BOUNDARY_LAYER_DEFAULTS: Readonly<BoundaryLayerOptions> = { field: 'velocity', edge: 'max', gradientFraction: 0.001 };

export interface BoundaryLayerResult {
  /** False when the quantities could not be found; `reason` says why and the numbers are NaN. */
  ok: boolean;
  reason?: string;
  /** The criterion, in words, for reports. */
  criterion: string;
  edgeVelocity: number;
  /** Arc length of the edge from the wall. */
  edgeDistance: number;
  delta99: number;
  displacementThickness: number;
  momentumThickness: number;
  shapeFactor: number;
  /** Samples from the wall to the edge. */
  samplesUsed: number;
  warnings: string[];
}

/** Boundary-layer quantities of a line probe whose start point is on the wall. */
export function boundaryLayer(r: LineProbeResult, options: Partial<BoundaryLayerOptions> = {}): BoundaryLayerResult {
  const o: BoundaryLayerOptions = { ...BOUNDARY_LAYER_DEFAULTS, ...options };
  if (o.edge !== 'max' && o.edge !== 'gradient') throw new Error(`boundary layer: edge must be "max" or "gradient", got "${String(o.edge)}"`);
  if (!(o.gradientFraction > 0 && o.gradientFraction < 1)) throw new Error(`boundary layer: gradientFraction must be in (0, 1), got ${o.gradientFraction}`);
  const criterion = o.edge === 'max'
    ? 'edge at the maximum of the profile (common practice, for profiles without overshoot)'
    : `edge at the first point where |du/ds| falls below ${o.gradientFraction * 100} % of its wall value (common practice)`;
  const fail = (reason: string): BoundaryLayerResult => ({
    ok: false, reason, criterion, edgeVelocity: NaN, edgeDistance: NaN, delta99: NaN, displacementThickness: NaN,
    momentumThickness: NaN, shapeFactor: NaN, samplesUsed: 0, warnings: [],
  });
  const f = r.fields.find((q) => q.name === o.field);
  if (!f) throw new Error(`boundary layer: field "${o.field}" was not sampled (sampled: ${r.fields.map((q) => q.name).join(', ') || 'none'})`);
  if (r.count === 0 || !r.valid[0]) return fail('the line does not start inside the mesh (its start point is taken as the wall)');
  let end = 0;
  while (end + 1 < r.count && r.intervalInside[end]) end++;
  const n = end + 1;
  if (n < 3) return fail(`only ${n} sample(s) before the first gap; need at least 3`);

  // u(s) along the profile.
  const u = new Float64Array(n);
  const lx = (r.to[0] - r.from[0]) / r.length, ly = (r.to[1] - r.from[1]) / r.length, lz = (r.to[2] - r.from[2]) / r.length;
  let qx = 0, qy = 0, qz = 0;
  if (o.direction) {
    const l = Math.hypot(o.direction[0], o.direction[1], o.direction[2]);
    if (!(l > 0)) throw new Error('boundary layer: direction must be a non-zero vector');
    qx = o.direction[0] / l; qy = o.direction[1] / l; qz = o.direction[2] / l;
  }
  for (let i = 0; i < n; i++) {
    if (f.components === 1) { u[i] = f.columns[0]![i]!; continue; }
    const vx = f.columns[0]![i]!, vy = f.columns[1]?.[i] ?? 0, vz = f.columns[2]?.[i] ?? 0;
    if (o.direction) { u[i] = vx * qx + vy * qy + vz * qz; continue; }
    const along = vx * lx + vy * ly + vz * lz;
    u[i] = Math.hypot(vx - along * lx, vy - along * ly, vz - along * lz);
  }
  const s = r.s;

  let ie = 0;
  if (o.edge === 'max') {
    for (let i = 1; i < n; i++) if (u[i]! > u[ie]!) ie = i;
  } else {
    const gw = Math.abs((u[1]! - u[0]!) / (s[1]! - s[0]!));
    ie = -1;
    for (let i = 1; i + 1 < n; i++) {
      if (Math.abs((u[i + 1]! - u[i]!) / (s[i + 1]! - s[i]!)) < o.gradientFraction * gw) { ie = i; break; }
    }
    if (ie < 0) return fail(`|du/ds| never fell below ${o.gradientFraction * 100} % of its wall value; extend the line beyond the boundary layer`);
  }
  const ue = u[ie]!;
  if (!(ue > 0)) return fail(`edge velocity ${ue} is not positive`);
  const warnings: string[] = [];
  if (Math.abs(u[0]!) > 0.01 * ue) warnings.push(`velocity at the start point is ${(100 * u[0]! / ue).toPrecision(3)} % of the edge velocity; is the start point on a no-slip wall?`);
  if (o.edge === 'max' && ie === n - 1) warnings.push('the profile maximum is at the last sample: the line may end inside the boundary layer');

  let d99 = NaN;
  for (let i = 1; i <= ie; i++) {
    if (u[i]! >= 0.99 * ue) {
      const a = u[i - 1]!, b = u[i]!;
      d99 = b === a ? s[i]! : s[i - 1]! + (s[i]! - s[i - 1]!) * (0.99 * ue - a) / (b - a);
      break;
    }
  }
  let dstar = 0, theta = 0;
  for (let i = 0; i < ie; i++) {
    const h = s[i + 1]! - s[i]!, a0 = u[i]! / ue, a1 = u[i + 1]! / ue;
    dstar += h * (1 - 0.5 * (a0 + a1));
    theta += h * (0.5 * (a0 + a1) - (a0 * a0 + a0 * a1 + a1 * a1) / 3);
  }
  return {
    ok: true, criterion, edgeVelocity: ue, edgeDistance: s[ie]! - s[0]!, delta99: d99, displacementThickness: dstar,
    momentumThickness: theta, shapeFactor: dstar / theta, samplesUsed: ie + 1, warnings,
  };
}
