/**
 * Evaluates every probe of a probe set on one dataset — the single path the command line, the worker and
 * the report use. The dataset is first converted to SI when the set declares other units
 * (`siDataset.ts`), so every number comes out in SI with its unit. A probe that cannot give its numbers
 * (a plane that misses the mesh, a point outside it, a field that does not exist …) is flagged as failed
 * with a message, never reported as zeros; one failing probe does not stop the others.
 *
 * Anchors and shapes (for pins and pictures) are in the file's length unit, like the set's geometry.
 */
import type { Dataset } from '../model/dataset.ts';
import type { BoundaryFaces } from '../surface/boundaryFaces.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../surface/surfaceCache.ts';
import type { SurfaceGroups } from '../surface/surfaceGroups.ts';
import { evaluateForce } from './evaluateForce.ts';
import { evaluateBalance, evaluateCutPlane, evaluateLoss } from './evaluatePlanes.ts';
import { evaluateLine, evaluatePoint } from './evaluateSamples.ts';
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
};

/** Evaluates every probe of a (checked) set on `dataset`. Never throws for a single probe's failure. */
export function evaluateProbeSet(dataset: Dataset, set: ProbeSet, options: Partial<EvaluateOptions> = {}): SetEvaluation {
  const o = { ...EVALUATE_DEFAULTS, ...options };
  const factors = siFactors(set.units);
  const d = siDataset(dataset, factors);
  const k = factors.length;
  const reference = resolveReference(set.reference);
  const declared = set.units?.fields ?? {};
  const ctx: EvalContext = {
    dataset: d, lengthFactor: k, reference, keepShapes: o.keepShapes,
    fieldUnit: (name) => fieldSiUnit(name.replace(/^(point|cell):/, ''), declared),
    surfaces: (g) => surfacesOf(d, g),
    si: (v) => [v[0] * k, v[1] * k, v[2] * k],
    file: (v) => [v[0]! / k, v[1]! / k, v[2]! / k],
  };
  const probes = set.probes.map((p) => {
    const out: ProbeOutcome = { id: p.id, kind: p.kind, label: probeLabel(p), ok: true, error: null, quantities: [], notes: [], anchor: null, definition: '' };
    try {
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
