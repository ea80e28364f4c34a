/**
 * Derived fields, computed on demand and attached to a copy of the dataset under their own names, so
 * every consumer that takes a field name (colour, cut, line, point, probe sets, the command line's
 * `--fields`) uses them like the file's own arrays.
 *
 * Names (a field of the same name in the file wins; `point:`/`cell:` prefixes are ignored here):
 *   velocity-gradient (9 components, ∂u_a/∂x_b row by row), vorticity (3), vorticity-magnitude,
 *   q-criterion, lambda2, helicity, velocity-magnitude, total-pressure, cp.
 * A derived field has the association of the field it comes from (point velocity → point data).
 * Gradients: quadratic least-squares reconstruction (quadraticGradient.ts), second order.
 * Units follow the inputs: with velocity in m/s and lengths in m, vorticity is 1/s, Q and λ₂ 1/s²,
 * helicity m/s², total pressure the pressure's unit, cp dimensionless.
 *
 * Total pressure p₀ = p + ½ρ|u|² takes ρ from a density field when `density` names one, else the
 * constant `density`; a kinematic pressure (p/ρ) gives p₀/ρ = p/ρ + ½|u|². cp = (p − p_ref)/(½ ρ U²)
 * from the reference density, speed and pressure (p_ref default 0); for a kinematic pressure
 * cp = (p/ρ − p_ref/ρ)/(½U²).
 */
import { cellCount, findField, pointCount, type Piece } from '../model/piece.ts';
import { commonFieldNames, type Dataset } from '../model/dataset.ts';
import type { FieldArray, NumericArray } from '../model/fieldArray.ts';
import { guessRole, pickField, type FieldInfo } from '../cut/fieldRoles.ts';
import { fieldGradient } from './fieldGradient.ts';
import { helicityOf, lambda2Of, magnitudeOf, qCriterionOf, vorticityOf } from './flowQuantities.ts';

/** What each derived field needs and its components. */
export const DERIVED_FIELDS = {
  'velocity-gradient': { components: 9, needs: 'velocity', about: '∂u_a/∂x_b, 9 components row by row (1/s)' },
  vorticity: { components: 3, needs: 'velocity', about: 'ω = ∇×u (1/s)' },
  'vorticity-magnitude': { components: 1, needs: 'velocity', about: '|ω| (1/s)' },
  'q-criterion': { components: 1, needs: 'velocity', about: 'Q = ½(‖Ω‖² − ‖S‖²) (1/s²)' },
  lambda2: { components: 1, needs: 'velocity', about: 'middle eigenvalue of S² + Ω² (1/s²)' },
  helicity: { components: 1, needs: 'velocity', about: 'u·ω (m/s²)' },
  'velocity-magnitude': { components: 1, needs: 'velocity', about: '|u| (m/s)' },
  'total-pressure': { components: 1, needs: 'pressure', about: 'p + ½ρ|u|² (Pa)' },
  cp: { components: 1, needs: 'pressure', about: '(p − p_ref)/(½ρU²)' },
} as const;

/** SI unit of each derived field when the inputs are SI. */
export const DERIVED_UNITS: Readonly<Record<DerivedName, string>> = {
  'velocity-gradient': '1/s', vorticity: '1/s', 'vorticity-magnitude': '1/s', 'q-criterion': '1/s²', lambda2: '1/s²',
  helicity: 'm/s²', 'velocity-magnitude': 'm/s', 'total-pressure': 'Pa', cp: '1',
};

export type DerivedName = keyof typeof DERIVED_FIELDS;

/** Inputs of the derived fields; defaults in DERIVE_DEFAULTS. */
export interface DeriveOptions {
  /** Velocity field name (default: found by the role rule of fieldRoles.ts). */
  velocity: string | undefined;
  /** Pressure field name (default: found by the role rule). */
  pressure: string | undefined;
  /** Constant density (kg/m³) or the name of a density field, for total pressure. */
  density: number | string | undefined;
  /** The pressure field holds p/ρ. */
  kinematicPressure: boolean;
  /** Reference values for cp: density ρ (kg/m³), speed U (m/s), pressure p_ref (Pa, default 0). */
  reference: { density?: number; speed?: number; pressure?: number };
}

export const DERIVE_DEFAULTS: DeriveOptions = {
  velocity: undefined, pressure: undefined, density: undefined, kinematicPressure: false, reference: {},
};

const bare = (n: string): string => n.replace(/^(point|cell):/, '');

/** Whether `name` (with or without a `point:`/`cell:` prefix) is a derived field's name. */
export function isDerivedName(name: string): name is DerivedName {
  return Object.prototype.hasOwnProperty.call(DERIVED_FIELDS, bare(name));
}

/** The derived names among `names` that the dataset does not hold as its own arrays. */
export function derivedNamesIn(d: Dataset, names: readonly string[]): DerivedName[] {
  const own = new Set([...commonFieldNames(d, 'point'), ...commonFieldNames(d, 'cell')]);
  const out: DerivedName[] = [];
  for (const n of names) {
    const b = bare(n);
    if (isDerivedName(b) && !own.has(b) && !out.includes(b)) out.push(b);
  }
  return out;
}

function fieldInfos(d: Dataset): FieldInfo[] {
  const out: FieldInfo[] = [];
  for (const association of ['point', 'cell'] as const) {
    for (const name of commonFieldNames(d, association)) {
      out.push({ name, association, components: findField(d.pieces[0]!, name, association)!.components });
    }
  }
  return out;
}

function role(d: Dataset, infos: FieldInfo[], given: string | undefined, r: 'velocity' | 'pressure', forWhat: string): FieldInfo {
  if (given) {
    const f = pickField(infos, given, forWhat);
    const want = r === 'velocity' ? 3 : 1;
    if (f.components !== want) throw new Error(`${forWhat}: field "${f.name}" has ${f.components} components, expected ${want} for the ${r}`);
    return f;
  }
  const g = guessRole(infos, r);
  if (!g.field) {
    throw new Error(`${forWhat} needs the ${r}: ${g.candidates.length > 1 ? `several candidates (${g.candidates.join(', ')})` : `no field named like a ${r}`} in ${d.source}; name it (--${r} <field>)`);
  }
  return g.field;
}

/** Derived fields computed from the velocity gradient. */
const FROM_GRADIENT: readonly DerivedName[] = ['velocity-gradient', 'vorticity', 'vorticity-magnitude', 'q-criterion', 'lambda2', 'helicity'];

/**
 * The velocity field whose gradient `withDerivedFields(d, names, options)` would reconstruct, or null when no
 * requested field needs a gradient (so a caller can compute that gradient elsewhere first and prime the
 * cache of fieldGradient.ts). Throws as `withDerivedFields` does when the velocity cannot be found.
 */
export function gradientFieldFor(d: Dataset, names: readonly string[], options: Partial<DeriveOptions> = {}): FieldInfo | null {
  const wanted = derivedNamesIn(d, names).filter((n) => FROM_GRADIENT.includes(n));
  if (wanted.length === 0) return null;
  const o = { ...DERIVE_DEFAULTS, ...options };
  return role(d, fieldInfos(d), o.velocity, 'velocity', `derived field "${wanted[0]}"`);
}

const cache = new WeakMap<Dataset, Map<string, Dataset>>();

/**
 * The dataset with the derived fields `names` attached (the same object when none is needed; copies
 * cached per dataset and request). Throws one line naming the field and what is missing.
 */
export function withDerivedFields(d: Dataset, names: readonly string[], options: Partial<DeriveOptions> = {}): Dataset {
  const wanted = derivedNamesIn(d, names);
  if (wanted.length === 0) return d;
  const o = { ...DERIVE_DEFAULTS, ...options };
  const key = JSON.stringify([wanted, o]);
  let byKey = cache.get(d);
  const hit = byKey?.get(key);
  if (hit) return hit;
  const infos = fieldInfos(d);
  const extra = d.pieces.map(() => ({ point: [] as FieldArray[], cell: [] as FieldArray[] }));
  for (const name of wanted) {
    const what = `derived field "${name}"`;
    const velocity = name === 'cp' ? undefined : role(d, infos, o.velocity, 'velocity', what);
    const pressure = DERIVED_FIELDS[name].needs === 'pressure' ? role(d, infos, o.pressure, 'pressure', what) : undefined;
    if (name === 'cp') checkReference(o);
    d.pieces.forEach((p, k) => {
      const f = name === 'cp' ? cpField(p, pressure!, o) : name === 'total-pressure' ? totalPressureField(d, p, velocity!, pressure!, o)
        : velocityField(p, velocity!, name);
      extra[k]![f.association === 'point' ? 'point' : 'cell'].push(f);
    });
  }
  const pieces: Piece[] = d.pieces.map((p, k) => ({
    ...p, pointData: [...p.pointData, ...extra[k]!.point], cellData: [...p.cellData, ...extra[k]!.cell],
  }));
  const out: Dataset = { ...d, pieces };
  if (!byKey) { byKey = new Map(); cache.set(d, byKey); }
  byKey.set(key, out);
  return out;
}

function checkReference(o: DeriveOptions): void {
  const r = o.reference;
  if (!(typeof r.density === 'number' && r.density > 0 && typeof r.speed === 'number' && r.speed > 0)) {
    throw new Error(`derived field "cp" needs a positive reference density and speed (got density ${r.density ?? 'none'}, speed ${r.speed ?? 'none'})`);
  }
  if (r.pressure !== undefined && !Number.isFinite(r.pressure)) throw new Error(`derived field "cp": reference pressure must be a finite number, got ${r.pressure}`);
}

const made = (name: string, association: 'point' | 'cell', components: number, values: Float64Array): FieldArray =>
  ({ name, association, components, values, sourceType: 'Float64 (derived)' });

/** A velocity-based derived field on one piece. */
function velocityField(p: Piece, info: FieldInfo, name: DerivedName): FieldArray {
  const u = findField(p, info.name, info.association)!;
  const assoc = info.association;
  if (name === 'velocity-magnitude') return made(name, assoc, 1, magnitudeOf(u.values, 3));
  const primed = primedQuantities.get(u.values)?.get(name);
  if (primed) return made(name, assoc, DERIVED_FIELDS[name].components, primed);
  const G = fieldGradient(p, u);
  return made(name, assoc, DERIVED_FIELDS[name].components, name === 'velocity-gradient' ? G : gradientQuantity(name, G, u.values));
}

/** The derived fields made from the velocity gradient alone, node by node (no gradient kept): `gradientQuantity`. */
export const NODE_QUANTITIES: readonly DerivedName[] = ['vorticity', 'vorticity-magnitude', 'q-criterion', 'lambda2', 'helicity'];

/**
 * Quantity `name` (one of NODE_QUANTITIES) at each site from the velocity gradients `G` (9 per site) and the
 * velocities `u` (3 per site, for helicity), `DERIVED_FIELDS[name].components` values per site, written into
 * `out` from index `at` when given (else a new array). Site by site, so a slice of sites gives the slice of the
 * whole result, bit for bit.
 */
export function gradientQuantity(name: DerivedName, G: Float64Array, u: ArrayLike<number>, out?: Float64Array, at = 0): Float64Array {
  // vorticity and Q straight into `out`; the others through an array of their own
  if (name === 'vorticity') return vorticityOf(G, out, at);
  if (name === 'q-criterion') return qCriterionOf(G, out, at);
  let v: Float64Array;
  switch (name) {
    case 'vorticity-magnitude': v = magnitudeOf(vorticityOf(G), 3); break;
    case 'lambda2': v = lambda2Of(G); break;
    case 'helicity': v = helicityOf(u, vorticityOf(G)); break;
    default: throw new Error(`derived field "${name}" is not made from the velocity gradient node by node`);
  }
  if (!out) return v;
  out.set(v, at);
  return out;
}

/** Quantities computed elsewhere (the worker pool), by velocity values array: `primeQuantity`. */
const primedQuantities = new WeakMap<object, Map<DerivedName, Float64Array>>();

/**
 * Hands `withDerivedFields` quantity `name` (one of NODE_QUANTITIES) of the velocity whose values array is
 * `values`, computed elsewhere (src/parallel/deriveShares.ts) as `gradientQuantity` computes it; it is then
 * attached as it is, without the gradient.
 */
export function primeQuantity(values: object, name: DerivedName, v: Float64Array): void {
  let m = primedQuantities.get(values);
  if (!m) { m = new Map(); primedQuantities.set(values, m); }
  m.set(name, v);
}

/** True when quantity `name` of the velocity values array `values` has been primed. */
export function hasPrimedQuantity(values: object, name: DerivedName): boolean {
  return primedQuantities.get(values)?.has(name) ?? false;
}

/** cp = (p − p_ref)/(½ρU²) on one piece (kinematic pressure: p_ref/ρ subtracted, divided by ½U²). */
function cpField(p: Piece, pressure: FieldInfo, o: DeriveOptions): FieldArray {
  const P = findField(p, pressure.name, pressure.association)!.values;
  const rho = o.reference.density!, U = o.reference.speed!, pRef = o.reference.pressure ?? 0;
  const shift = o.kinematicPressure ? pRef / rho : pRef, q = o.kinematicPressure ? 0.5 * U * U : 0.5 * rho * U * U;
  const out = new Float64Array(P.length);
  for (let i = 0; i < P.length; i++) out[i] = (P[i]! - shift) / q;
  return made('cp', pressure.association, 1, out);
}

/** p₀ = p + ½ρ|u|² on one piece (see the file comment for ρ and the kinematic form). */
function totalPressureField(d: Dataset, p: Piece, velocity: FieldInfo, pressure: FieldInfo, o: DeriveOptions): FieldArray {
  if (velocity.association !== pressure.association) {
    throw new Error(`derived field "total-pressure": velocity "${velocity.name}" is ${velocity.association} data but pressure "${pressure.name}" is ${pressure.association} data; both must be the same`);
  }
  const U = findField(p, velocity.name, velocity.association)!.values, P = findField(p, pressure.name, pressure.association)!.values;
  let rhoField: NumericArray | undefined, rho = 1;
  if (!o.kinematicPressure) {
    if (typeof o.density === 'string') {
      const f = findField(p, bare(o.density), velocity.association);
      if (!f || f.components !== 1) throw new Error(`derived field "total-pressure": no 1-component ${velocity.association} density field "${o.density}" in ${d.source}`);
      rhoField = f.values;
    } else if (typeof o.density === 'number' && o.density > 0) rho = o.density;
    else throw new Error('derived field "total-pressure" needs a density: give a positive constant or a density field (--rho), or say the pressure is kinematic');
  }
  const n = velocity.association === 'point' ? pointCount(p) : cellCount(p), out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const ux = U[3 * i]!, uy = U[3 * i + 1]!, uz = U[3 * i + 2]!;
    out[i] = P[i]! + 0.5 * (rhoField ? rhoField[i]! : rho) * (ux * ux + uy * uy + uz * uz);
  }
  return made('total-pressure', velocity.association, 1, out);
}
