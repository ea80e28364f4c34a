/**
 * Values that are rounding noise relative to a stated scale: a lift coefficient of −5.6×10⁻¹⁴ beside a drag
 * coefficient of 27 620, a net mass flow of 7×10⁻¹⁸ kg/s against 0.0154 kg/s flowing in, or a pressure mean
 * of 1.4×10⁻¹⁶ Pa along a line on which p runs from −4.5 to +4.5 Pa. The number is kept (never hidden: the
 * CSV and JSON exports carry it at full precision) and marked `(≈ 0 relative to max |p| on the line)`.
 * Pure: no DOM.
 *
 * The rule: a value is rounding noise when it is non-zero and |value| ≤ `NOISE_FRACTION` × scale, the scale
 * being what the value is made of, in the same unit:
 *  - a mean (or a mean's component) over samples — a line probe's, a wall group's, an iso-surface's colour —
 *    against the largest magnitude the same quantity takes over the same samples, max(|min|, |max|)
 *    (`max |p| on the line`);
 *  - a point value against the largest magnitude of its field over the mesh (the load report's range; the
 *    magnitude for a vector's components): `max |p| in the mesh`;
 *  - a cut-plane's area or mass-flow mean of a field against that field's largest magnitude over the mesh;
 *    p₀ means against max |p| + ½ρ·max |u|²; integrals against the field's largest magnitude × the plane's
 *    area: Q against max |u|·A, ṁ against ρ·max |u|·A (ρ the reference density, or the density field's
 *    largest value);
 *  - a force total's parts against the force's magnitude (coefficients against the largest coefficient), or,
 *    when the evaluation gives it, against Σ|dF| (coefficients Σ|dF|/(q·A)): the force with nothing cancelling,
 *    so a force whose every part is noise (a closed body in a uniform pressure) is marked too;
 *  - a balance's net flux and imbalance share against its inflow.
 * Other quantities (lengths, areas, shares, coefficients of uniformity, extremes) get no scale and are never
 * marked. A mean of n terms carries a rounding error of about n·1.1×10⁻¹⁶ of the largest term, ~10⁻¹⁰ for
 * a million terms, so 10⁻⁹ of the largest magnitude sits above it.
 */
import { withUnit } from './format.ts';
import type { ProbeKind, Quantity } from './results.ts';
import type { LoadReport } from '../model/loadReport.ts';
import { guessRole, type FieldInfo } from '../cut/fieldRoles.ts';

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
 * along drag, lift and side); a mass balance's net flux and imbalance share its inflow; means with their
 * minimum and maximum beside them (lines, wall groups, iso-surfaces) the larger magnitude of those; with
 * `context`, a point's values and a cut-plane's means and integrals scales from the mesh (file comment).
 * A scale already set (by the probe's tool) is kept.
 */
export function assignNoiseScales(kind: ProbeKind, quantities: Quantity[], context: NoiseContext = {}): Quantity[] {
  const byKey = new Map(quantities.map((q) => [q.key, q]));
  sampleMeanScales(kind, quantities, byKey);
  if (kind === 'point' && context.fields) pointScales(quantities, context.fields.of);
  if (kind === 'plane' && context.fields) planeScales(quantities, byKey, context.fields, context);
  if (kind === 'force') {
    const main = MAIN_COEFFICIENTS.map((k) => byKey.get(k)).filter((q): q is Quantity => !!q && Number.isFinite(q.value));
    const top = main.reduce<Quantity | undefined>((a, q) => (!a || Math.abs(q.value) > Math.abs(a.value) ? q : a), undefined);
    const axes = TOTAL_ALONG_AXES.map((keys) => keys.map((k) => byKey.get(k)?.value)).find((v) => v.every((x) => x !== undefined)) as number[] | undefined;
    const magnitude = axes ? Math.hypot(...axes) : NaN;
    for (const q of quantities) {
      // the net force's own size marks a part small beside it; a size given with the outcome (Σ|dF|) marks a
      // force whose parts all cancel, which its own size cannot
      const own = top && COEFFICIENTS.includes(q.key) ? { value: Math.abs(top.value), label: top.label }
        : FORCES.includes(q.key) && Number.isFinite(magnitude) ? { value: magnitude, label: '|F|' } : undefined;
      if (own && (!q.scale || isRoundingNoise(q.value, own))) q.scale = own;
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

/** What the mesh-based scales need: the fields' largest magnitudes and the roles the plane used. */
export interface NoiseContext {
  /** The fields' largest magnitudes over the mesh (`meshMagnitudes`). */
  fields?: FieldMagnitudes;
  /** Names of the fields a cut-plane used (its own role choice); guessed by the role rule when absent. */
  roles?: { velocity?: string | undefined; pressure?: string | undefined };
  /** Density of ṁ: a number (kg/m³) or the name of the density field. */
  density?: number | string | undefined;
}

/** max(|min|, |max|): the largest magnitude a quantity takes between its extremes; NaN when either is not finite. */
export function rangeMagnitude(min: number, max: number): number {
  return Number.isFinite(min) && Number.isFinite(max) ? Math.max(Math.abs(min), Math.abs(max)) : NaN;
}

/** The scale of a mean over samples whose extremes are `min` and `max`: `max |p| on the line`. */
export function sampleScale(min: number, max: number, what: string, where: string): NoiseScale | undefined {
  const value = rangeMagnitude(min, max);
  // a magnitude's label already carries its bars (`|velocity|`)
  const abs = /^\|.*\|$/.test(what) ? what : `|${what}|`;
  return Number.isFinite(value) && value > 0 ? { value, label: `max ${abs} ${where}` } : undefined;
}

/**
 * Largest magnitude of each field over the mesh, from the load report's ranges (a vector's magnitude; point
 * data preferred over cell data of the same name), times `factors[name]` when the probe reports the field in
 * other units than the file (a probe set's SI conversion).
 */
export function meshMagnitudes(report: Pick<LoadReport, 'pointData' | 'cellData'>, factors: Readonly<Record<string, number>> = {}): FieldMagnitudes {
  const m = new Map<string, number>(), info = new Map<string, FieldInfo>();
  for (const a of [...report.cellData, ...report.pointData]) {
    if (!a.range) continue;
    m.set(a.name, rangeMagnitude(a.range[0], a.range[1]) * (factors[a.name] ?? 1));
    info.set(a.name, { name: a.name, association: a.association === 'cell' ? 'cell' : 'point', components: a.components });
  }
  return { of: (name) => m.get(name), fields: [...info.values()] };
}

/** Largest magnitudes of a mesh's fields: `of(name)` (undefined for a field it does not have) and the fields it knows. */
export interface FieldMagnitudes {
  of(name: string): number | undefined;
  readonly fields: readonly FieldInfo[];
}

/** Where the samples of each kind's means lie, for the scale's label. */
const SAMPLES_WHERE: Partial<Record<ProbeKind, string>> = { line: 'on the line', wall: 'on the group', iso: 'on the surface' };

/** Means with extremes beside them (`X.mean` with `X.min` and/or `X.max`): the larger magnitude of the extremes. */
function sampleMeanScales(kind: ProbeKind, quantities: Quantity[], byKey: Map<string, Quantity>): void {
  const where = SAMPLES_WHERE[kind];
  if (!where) return;
  for (const q of quantities) {
    if (q.scale || !q.key.endsWith('.mean')) continue;
    const stem = q.key.slice(0, -'.mean'.length);
    const lo = byKey.get(`${stem}.min`)?.value, hi = byKey.get(`${stem}.max`)?.value;
    if (lo === undefined && hi === undefined) continue;
    const what = q.label.replace(/ mean$/, '');
    const scale = sampleScale(lo ?? hi!, hi ?? lo!, what, where);
    if (scale) q.scale = scale;
  }
}

/** A point's values (`p`, `velocity_x`, `|velocity|`): the field's largest magnitude over the mesh. */
function pointScales(quantities: Quantity[], magnitude: (name: string) => number | undefined): void {
  for (const q of quantities) {
    if (q.scale) continue;
    const name = fieldOfKey(q.key, magnitude);
    const value = name === undefined ? undefined : magnitude(name);
    if (value !== undefined && Number.isFinite(value) && value > 0) q.scale = { value, label: `max |${name}| in the mesh` };
  }
}

/** The field a point quantity's key names: itself, `|name|`, or the longest field name the key starts with (a component). */
function fieldOfKey(key: string, magnitude: (name: string) => number | undefined): string | undefined {
  if (magnitude(key) !== undefined) return key;
  const bare = /^\|(.*)\|$/.exec(key)?.[1];
  if (bare !== undefined && magnitude(bare) !== undefined) return bare;
  for (let n = key.length - 1; n > 0; n--) {
    const name = key.slice(0, n);
    if (/[^A-Za-z0-9]$/.test(name) || /[^A-Za-z0-9]/.test(key[n]!)) {
      const trimmed = name.replace(/[^A-Za-z0-9]+$/, '');
      if (trimmed && magnitude(trimmed) !== undefined) return trimmed;
    }
  }
  return undefined;
}

/**
 * A cut-plane's means and integrals (the view tool's keys and the probe set's, any prefix such as
 * `upstream.`): means against the field's largest magnitude over the mesh, Q and ṁ against it × the area.
 */
function planeScales(quantities: Quantity[], byKey: Map<string, Quantity>, fields: FieldMagnitudes, c: NoiseContext): void {
  const mag = fields.of;
  const u = c.roles?.velocity ?? guessRole(fields.fields, 'velocity').field?.name;
  const p = c.roles?.pressure ?? guessRole(fields.fields, 'pressure').field?.name;
  const U = u === undefined ? undefined : mag(u), P = p === undefined ? undefined : mag(p);
  const rho = typeof c.density === 'number' ? c.density : typeof c.density === 'string' ? mag(c.density) : undefined;
  for (const q of quantities) {
    if (q.scale) continue;
    const k = q.key;
    const prefix = /^(upstream|downstream)\./.exec(k)?.[0] ?? '';
    const A = byKey.get(`${prefix}area`)?.value;
    let value: number | undefined, label = '';
    if (/(^|\.)volumeFlowRate$/.test(k) && U !== undefined && A !== undefined) { value = U * A; label = `max |${u}|·A`; }
    else if (/(^|\.)massFlowRate$/.test(k) && U !== undefined && A !== undefined && rho !== undefined) { value = rho * U * A; label = `ρ·max |${u}|·A`; }
    else if (/(^|\.)(meanNormalVelocity|velocityMagnitudeMassMean|velocityMagnitude\.massFlowMean)$/.test(k) && U !== undefined) { value = U; label = `max |${u}| in the mesh`; }
    else if (/(^|\.)(pressureAreaMean|pressureMassMean|staticPressure\.areaMean|staticPressure\.massFlowMean)$/.test(k) && P !== undefined) { value = P; label = `max |${p}| in the mesh`; }
    else if (/(^|\.)(totalPressureAreaMean|totalPressureMassMean|totalPressure\.areaMean|totalPressure\.massFlowMean)$/.test(k) && P !== undefined) {
      value = P + (U !== undefined && rho !== undefined ? 0.5 * rho * U * U : 0); label = `max |${p}| + ½ρ·max |${u ?? 'u'}|²`;
    }
    if (value !== undefined && Number.isFinite(value) && value > 0) q.scale = { value, label };
  }
}
