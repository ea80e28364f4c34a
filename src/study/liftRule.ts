/**
 * The lift direction when the user does not set one, by a rule that is stated wherever the result goes
 * (never a silent +z):
 *
 *  1. A mesh much thinner along one axis than along the other two (its smallest extent below
 *     `THIN_FRACTION` of the next smallest; a 2D case extruded along that axis) gives lift perpendicular to
 *     the drag direction in the plane of the two largest extents: lift ∥ e_thin × drag.
 *  2. Otherwise (a 3D case, or drag along the thin axis) lift is the coordinate axis most perpendicular to
 *     drag, preferring z, then y, then x on ties ("up" is +z in most 3D set-ups: common practice).
 *
 * Either way the part along drag is removed, the result normalised, and its largest component made
 * positive. Pure: no DOM.
 */
import type { Bounds } from '../model/bounds.ts';
import type { Vec3 } from './probeSet.ts';

/** An axis is "thin" when its extent is below this fraction of the next smallest extent (common practice for telling an extruded 2D case). */
export const THIN_FRACTION = 0.2;

/** A derived lift direction and the rule that gave it, in words. */
export interface DerivedLift {
  /** Unit vector ⟂ drag. */
  direction: Vec3;
  /** `thin-axis` (rule 1) or `up-axis` (rule 2). */
  rule: 'thin-axis' | 'up-axis';
  /** The rule as a sentence for pins, tables and reports. */
  text: string;
}

const AXES = ['x', 'y', 'z'] as const;

function unit(v: readonly number[]): Vec3 | undefined {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return n > 0 && Number.isFinite(n) ? [v[0]! / n, v[1]! / n, v[2]! / n] : undefined;
}

/** Normalises and flips so that the component of largest magnitude is positive. */
function positive(v: Vec3): Vec3 {
  let k = 0;
  for (let i = 1; i < 3; i++) if (Math.abs(v[i]!) > Math.abs(v[k]!) + 1e-12) k = i;
  const s = v[k]! < 0 ? -1 : 1;
  // +0 instead of −0, so the text reads (0, 1, 0)
  return [s * v[0] + 0, s * v[1] + 0, s * v[2] + 0];
}

/** 6 significant figures, as the definitions print. */
const v6 = (v: Vec3) => `(${v.map((x) => String(Number(x.toPrecision(6)))).join(', ')})`;

/**
 * The lift direction for `drag` on a mesh with bounds `bounds` ([xmin, xmax, ymin, ymax, zmin, zmax], any
 * length unit). Throws when `drag` has no direction.
 */
export function deriveLift(drag: readonly number[], bounds: Bounds): DerivedLift {
  const d = unit(drag);
  if (!d) throw new Error(`lift rule: the drag direction (${drag.join(', ')}) has no direction`);
  const ext = [bounds[1] - bounds[0], bounds[3] - bounds[2], bounds[5] - bounds[4]];
  const order = [0, 1, 2].sort((a, b) => ext[a]! - ext[b]!);
  const thin = order[0]!, next = ext[order[1]!]!;
  if (next > 0 && ext[thin]! < THIN_FRACTION * next) {
    const e: Vec3 = [0, 0, 0];
    e[thin] = 1;
    const c = unit([e[1] * d[2] - e[2] * d[1], e[2] * d[0] - e[0] * d[2], e[0] * d[1] - e[1] * d[0]]);
    // a drag along the thin axis leaves no plane: fall through to rule 2
    if (c && Math.abs(d[thin]!) < 0.999) {
      const dir = positive(c);
      return {
        direction: dir, rule: 'thin-axis',
        text: `lift ${v6(dir)} derived: the mesh is thin along ${AXES[thin]} (a 2D case), so lift is ⟂ drag in the plane of the two largest extents`,
      };
    }
  }
  // rule 2: the most perpendicular axis, z then y then x on ties
  let best = 2;
  for (const k of [1, 0]) if (Math.abs(d[k]!) < Math.abs(d[best]!) - 1e-9) best = k;
  const a: Vec3 = [0, 0, 0];
  a[best] = 1;
  const dot = a[0] * d[0] + a[1] * d[1] + a[2] * d[2];
  const dir = positive(unit([a[0] - dot * d[0], a[1] - dot * d[1], a[2] - dot * d[2]])!);
  return {
    direction: dir, rule: 'up-axis',
    text: `lift ${v6(dir)} derived: a 3D case, so lift is along ${AXES[best]}, the axis most ⟂ drag (z preferred); set the lift direction if "up" is another axis`,
  };
}
