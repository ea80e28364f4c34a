/**
 * A probe set evaluated by several compute workers: the probes are dealt out to the workers, each worker
 * evaluates its own probes with the unchanged `evaluateProbeSet` on the whole dataset (it holds it in shared
 * memory), and the outcomes are put back in the set's order. Each probe is computed by the same code on the
 * same arrays as in one thread, so every number is the single-thread number (bit for bit, not only to rounding).
 *
 * Dealing (`dealProbes`): probes that read the boundary (force totals, wall quantities, anything naming
 * `geometry.surfaces`) all go to one worker, so the boundary faces and surface groups are extracted once; the
 * others go, in set order, to the worker with the least work so far, work counted in planes to cut (a
 * cut-plane 1, a pressure loss 2, a mass balance one per plane), lines (1) and points (¼). Each worker gets a
 * copy of the set holding only its probes, with the set's units, reference and formulas unchanged.
 */
import type { Probe, ProbeSet } from '../study/probeSet.ts';
import type { SetEvaluation } from '../study/evaluate.ts';

/** Work of the boundary extraction, in the units of `probeWork` (about four cuts on a large mesh). */
export const BOUNDARY_WORK = 4;

/** Whether a probe reads the boundary faces (so it joins the one worker that extracts them). */
export function readsBoundary(p: Probe): boolean {
  if (p.kind === 'force' || p.kind === 'wall') return true;
  const g = (p as { geometry?: { surfaces?: unknown } }).geometry;
  return Array.isArray(g?.surfaces) && g.surfaces.length > 0;
}

/** Estimated work of one probe (cuts, lines, points), beside the boundary's. */
export function probeWork(p: Probe): number {
  switch (p.kind) {
    case 'cut-plane': return 1;
    case 'pressure-loss': return 2;
    case 'mass-balance': return (p.geometry.planes?.length ?? 0) || 1;
    case 'point': return 0.25;
    default: return 1;
  }
}

/**
 * Which worker evaluates each probe: `lane[i]` for probe i, 0 … workers − 1. Deterministic (set order,
 * ties to the lower worker); the boundary readers share worker 0.
 */
export function dealProbes(probes: readonly Probe[], workers: number): Int32Array {
  const lane = new Int32Array(probes.length);
  const load = new Float64Array(Math.max(1, workers));
  let boundary = false;
  probes.forEach((p, i) => {
    if (!readsBoundary(p)) return;
    if (!boundary) { load[0] = load[0]! + BOUNDARY_WORK; boundary = true; }
    load[0] = load[0]! + probeWork(p);
    lane[i] = 0;
  });
  probes.forEach((p, i) => {
    if (readsBoundary(p)) return;
    let best = 0;
    for (let w = 1; w < load.length; w++) if (load[w]! < load[best]!) best = w;
    lane[i] = best;
    load[best] = load[best]! + probeWork(p);
  });
  return lane;
}

/** The set of worker `w`: the same set with only the probes dealt to it (null when it has none). */
export function subSet(set: ProbeSet, lane: Int32Array, w: number): ProbeSet | null {
  const probes = set.probes.filter((_, i) => lane[i] === w);
  return probes.length ? { ...set, probes } : null;
}

/**
 * Puts the workers' evaluations back together in the set's order: `parts[w]` is worker w's evaluation of
 * `subSet(set, lane, w)` (null for a worker with no probes).
 */
export function joinEvaluations(set: ProbeSet, lane: Int32Array, parts: readonly (SetEvaluation | null)[]): SetEvaluation {
  const first = parts.find((p): p is SetEvaluation => p !== null);
  if (!first) throw new Error('worker pool: a probe set with no probes was evaluated');
  const next = new Int32Array(parts.length);
  const probes = set.probes.map((p, i) => {
    const w = lane[i]!, part = parts[w];
    const o = part?.probes[next[w]!++];
    if (!o || o.id !== p.id) throw new Error(`worker pool: worker ${w} returned no outcome for probe "${p.id}"`);
    return o;
  });
  return { ...first, probes, failed: probes.filter((o) => !o.ok).length };
}
