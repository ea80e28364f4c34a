/**
 * Evaluates every probe of a probe set on one dataset — the single path the command line, the worker and
 * the report use. The dataset is first converted to SI when the set declares other units
 * (`siDataset.ts`), so every number comes out in SI with its unit. A probe that cannot give its numbers
 * (a plane that misses the mesh, a point outside it, a field that does not exist …) is flagged as failed
 * with a message, never reported as zeros; one failing probe does not stop the others.
 *
 * Anchors and shapes (for pins and pictures) are in the file's length unit, like the set's geometry.
 */
import { derivedNamesIn, withDerivedFields, type DeriveOptions } from '../derive/derivedFields.ts';
import { withFormulaFields } from '../derive/formulaFields.ts';
import type { Dataset } from '../model/dataset.ts';
import type { BoundaryFaces } from '../surface/boundaryFaces.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../surface/surfaceCache.ts';
import type { SurfaceGroups } from '../surface/surfaceGroups.ts';
import { evaluateForce } from './evaluateForce.ts';
import { evaluateBalance, evaluateCutPlane, evaluateLoss } from './evaluatePlanes.ts';
import { evaluateLine, evaluatePoint } from './evaluateSamples.ts';
import { evaluateWall } from './evaluateWall.ts';
import { evaluateIso } from './evaluateIso.ts';
import { resolveReference, type EvalContext, type ProbeOutcome, type ResolvedReference } from './outcome.ts';
import { probeLabel, type Probe, type ProbeKind, type ProbeSet, type SurfaceGrouping } from './probeSet.ts';
import { siDataset, siFactors } from './siDataset.ts';
import { fieldSiUnit } from './units.ts';

export { resolveReference } from './outcome.ts';
export type { EvalContext, ProbeOutcome, ProbeShape, Quantity, ResolvedReference } from './outcome.ts';

/** Every probe's outcome on one dataset. */
export interface SetEvaluation {
  /** The dataset's source name. */
  source: string;
  probes: ProbeOutcome[];
  /** Number of failed probes. */
  failed: number;
  /** The file's length unit (anchors, shapes); outputs are SI. */
  lengthUnit: string;
  /** Reference values used (SI), preset applied. */
  reference: ResolvedReference;
}

export interface EvaluateOptions {
  /** Keep the cut triangles, line segments and points for pictures. Default false. */
  keepShapes: boolean;
}

export const EVALUATE_DEFAULTS: EvaluateOptions = { keepShapes: false };

function surfacesOf(d: Dataset, g: SurfaceGrouping | undefined): { faces: BoundaryFaces; groups: SurfaceGroups } {
  const faces = getBoundaryFaces(d);
  if (faces.count === 0) throw new Error(`${d.source}: no boundary faces (surfaces need a volume mesh)`);
  return { faces, groups: getSurfaceGroups(d, g ?? {}) };
}

type KindEvaluator = (ctx: EvalContext, p: Probe, out: ProbeOutcome) => void;

const EVALUATORS: Record<ProbeKind, KindEvaluator> = {
  'cut-plane': evaluateCutPlane as KindEvaluator,
  line: evaluateLine as KindEvaluator,
  point: evaluatePoint as KindEvaluator,
  force: evaluateForce as KindEvaluator,
  'pressure-loss': evaluateLoss as KindEvaluator,
  'mass-balance': evaluateBalance as KindEvaluator,
  wall: evaluateWall as KindEvaluator,
  iso: evaluateIso as KindEvaluator,
};

/** Evaluates every probe of a (checked) set on `dataset`. Never throws for a single probe's failure. */
export function evaluateProbeSet(dataset: Dataset, set: ProbeSet, options: Partial<EvaluateOptions> = {}): SetEvaluation {
  const o = { ...EVALUATE_DEFAULTS, ...options };
  const factors = siFactors(set.units);
  const reference = resolveReference(set.reference);
  const declared = set.units?.fields ?? {};
  const derived = withSetDerivedFields(siDataset(dataset, factors), set, reference);
  const derivedFailed = derived.failed;
  const formulas = withSetFormulas(derived.dataset, set, reference, declared, derivedFailed);
  const d = formulas.dataset;
  const k = factors.length;
  const ctx: EvalContext = {
    dataset: d, lengthFactor: k, reference, keepShapes: o.keepShapes,
    fieldUnit: (name) => formulas.units[name.replace(/^(point|cell):/, '')] ?? fieldSiUnit(name.replace(/^(point|cell):/, ''), declared),
    surfaces: (g) => surfacesOf(d, g),
    si: (v) => [v[0] * k, v[1] * k, v[2] * k],
    file: (v) => [v[0]! / k, v[1]! / k, v[2]! / k],
  };
  const probes = set.probes.map((p) => {
    const out: ProbeOutcome = { id: p.id, kind: p.kind, label: probeLabel(p), ok: true, error: null, quantities: [], notes: [], anchor: null, definition: '' };
    try {
      const bad = fieldNamesOf(p).find((n) => derivedFailed.has(n.replace(/^(point|cell):/, '')));
      if (bad) throw new Error(derivedFailed.get(bad.replace(/^(point|cell):/, ''))!);
      EVALUATORS[p.kind](ctx, p, out);
    } catch (e) {
      out.ok = false;
      out.error = (e as Error).message.split('\n')[0]!;
    }
    if (!out.ok && !out.error) out.error = 'no result';
    // a note the error already says is not repeated
    if (out.error) out.notes = out.notes.filter((n) => !out.error!.includes(n));
    return out;
  });
  return { source: dataset.source, probes, failed: probes.filter((p) => !p.ok).length, lengthUnit: set.units?.length ?? 'm', reference };
}

/** Every field name a probe's `fields` names (strings and lists of strings). */
export function fieldNamesOf(p: Probe): string[] {
  const out: string[] = [];
  const f = (p as { fields?: Record<string, unknown> }).fields;
  for (const v of Object.values(f ?? {})) {
    if (typeof v === 'string') out.push(v);
    else if (Array.isArray(v)) for (const x of v) if (typeof x === 'string') out.push(x);
  }
  return out;
}

/**
 * The dataset with the derived fields the set's probes name (src/derive/derivedFields.ts), cp on the set's
 * reference density, speed and pressure; a derived field that cannot be made is left out and its reason
 * kept, so only the probes that use it fail.
 */
function deriveOptions(reference: ResolvedReference): Partial<DeriveOptions> {
  return {
    ...(reference.density !== undefined ? { density: reference.density } : {}),
    reference: {
      ...(reference.density !== undefined ? { density: reference.density } : {}),
      ...(reference.speed !== undefined ? { speed: reference.speed } : {}),
      ...(reference.pressure !== undefined ? { pressure: reference.pressure } : {}),
    },
  };
}

function withSetDerivedFields(d: Dataset, set: ProbeSet, reference: ResolvedReference): { dataset: Dataset; failed: Map<string, string> } {
  const names = derivedNamesIn(d, set.probes.flatMap(fieldNamesOf)).filter((n) => !(set.formulas ?? []).some((f) => f.name === n));
  const failed = new Map<string, string>();
  if (names.length === 0) return { dataset: d, failed };
  const o = deriveOptions(reference);
  const ok = names.filter((n) => {
    try { withDerivedFields(d, [n], o); return true; } catch (e) { failed.set(n, (e as Error).message.split('\n')[0]!); return false; }
  });
  return { dataset: withDerivedFields(d, ok, o), failed };
}

/**
 * The dataset with the set's formulas attached one by one (src/derive/formulaFields.ts) and their SI
 * units; a formula that fails is left out, its message kept in `failed` under its name (so only the probes
 * naming it, or formulas after it that use it, fail).
 */
function withSetFormulas(d: Dataset, set: ProbeSet, reference: ResolvedReference, declared: Record<string, string>,
  failed: Map<string, string>): { dataset: Dataset; units: Record<string, string> } {
  let cur = d;
  const units: Record<string, string> = {};
  const ctx = {
    reference: { density: reference.density, viscosity: reference.viscosity, speed: reference.speed, pressure: reference.pressure, area: reference.area, length: reference.length },
    unitOf: (name: string) => units[name] ?? fieldSiUnit(name, declared),
    derive: deriveOptions(reference),
  };
  for (const f of set.formulas ?? []) {
    try {
      const r = withFormulaFields(cur, [f], ctx);
      cur = r.dataset;
      Object.assign(units, r.units);
    } catch (e) {
      failed.set(f.name, (e as Error).message.split('\n')[0]!);
    }
  }
  return { dataset: cur, units };
}
