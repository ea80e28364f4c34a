/**
 * Values that are rounding noise relative to their own quantity's scale: a lift coefficient of −5.6×10⁻¹⁴
 * beside a drag coefficient of 27 620, or a net mass flow of 7×10⁻¹⁸ kg/s against 0.0154 kg/s flowing in.
 * The number is kept (never hidden) and marked `(≈ 0 relative to C_D)`. Only quantities with a natural
 * scale in the same result get one: the parts of a force against the force's magnitude (coefficients
 * against the largest coefficient), and a balance's net flux against its inflow. Pure: no DOM.
 */
import { withUnit } from './format.ts';
import type { ProbeKind, Quantity } from './results.ts';

/**
 * A value at most this fraction of its scale is rounding noise. Sums of n double-precision terms carry a
 * rounding error up to about n·1.1×10⁻¹⁶ of their magnitude, ~10⁻¹⁰ for a million faces; no flow solution
 * resolves anything near 10⁻⁹ of a force or a flux (solver tolerances sit far above it; common practice).
 */
export const NOISE_FRACTION = 1e-9;

/** What a quantity is compared with: the scale's value (same unit) and its name, e.g. `C_D`, `|F|`, `ṁ in`. */
export interface NoiseScale {
  value: number;
  label: string;
}

/** True when `value` is non-zero and at most `NOISE_FRACTION` of a finite, non-zero scale. */
export function isRoundingNoise(value: number, scale: NoiseScale | undefined): boolean {
  if (!scale || !Number.isFinite(value) || value === 0 || !Number.isFinite(scale.value) || scale.value === 0) return false;
  return Math.abs(value) <= NOISE_FRACTION * Math.abs(scale.value);
}

/** The mark after a noise value, ` (≈ 0 relative to C_D)`, or '' for a value that is not noise. */
export function noiseMark(value: number, scale: NoiseScale | undefined): string {
  return isRoundingNoise(value, scale) ? ` (≈ 0 relative to ${scale!.label})` : '';
}

/** A quantity as the screen shows it: value, unit and, for rounding noise, its mark. */
export function quantityText(q: Quantity, sig?: number, plain = false): string {
  return withUnit(q.value, q.unit, sig, plain) + noiseMark(q.value, q.scale);
}

/** Force-coefficient keys (view tool's and probe set's spellings); drag, lift, side first. */
const COEFFICIENTS = ['CD', 'CL', 'CS', 'CDpressure', 'CDviscous', 'CD.pressure', 'CD.viscous'];
const MAIN_COEFFICIENTS = ['CD', 'CL', 'CS'];
/** Force-component keys of both spellings; the first three of each are the total along drag, lift, side. */
const FORCES = ['dragForce', 'liftForce', 'sideForce', 'dragPressure', 'dragViscous', 'forceX', 'forceY', 'forceZ',
  'force.drag', 'force.lift', 'force.side', 'pressureForce.drag', 'viscousForce.drag', 'force.x', 'force.y', 'force.z'];
const TOTAL_ALONG_AXES = [['dragForce', 'liftForce', 'sideForce'], ['force.drag', 'force.lift', 'force.side']];

/**
 * Gives the quantities of one probe the scales they are judged against (in place; returns them):
 * a force total's coefficients the largest of C_D, C_L, C_S; its force components |F| (from the totals
 * along drag, lift and side); a mass balance's net flux and imbalance share its inflow. Others get none.
 */
export function assignNoiseScales(kind: ProbeKind, quantities: Quantity[]): Quantity[] {
  const byKey = new Map(quantities.map((q) => [q.key, q]));
  if (kind === 'force') {
    const main = MAIN_COEFFICIENTS.map((k) => byKey.get(k)).filter((q): q is Quantity => !!q && Number.isFinite(q.value));
    const top = main.reduce<Quantity | undefined>((a, q) => (!a || Math.abs(q.value) > Math.abs(a.value) ? q : a), undefined);
    const axes = TOTAL_ALONG_AXES.map((keys) => keys.map((k) => byKey.get(k)?.value)).find((v) => v.every((x) => x !== undefined)) as number[] | undefined;
    const magnitude = axes ? Math.hypot(...axes) : NaN;
    for (const q of quantities) {
      if (top && COEFFICIENTS.includes(q.key)) q.scale = { value: Math.abs(top.value), label: top.label };
      else if (FORCES.includes(q.key) && Number.isFinite(magnitude)) q.scale = { value: magnitude, label: '|F|' };
    }
  } else if (kind === 'mass-balance') {
    const inflow = byKey.get('inflow');
    if (inflow && Number.isFinite(inflow.value)) {
      const net = byKey.get('net'), share = byKey.get('imbalanceShare');
      if (net) net.scale = { value: inflow.value, label: inflow.label };
      // the share is net/inflow: its scale is 1 (the inflow itself)
      if (share) share.scale = { value: 1, label: inflow.label };
    }
  }
  return quantities;
}
