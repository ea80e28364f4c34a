/**
 * A probe outcome of the worker's set evaluation (the study layer's evaluators, the command line's path)
 * as a row of the results table and a pin: same numbers, SI units, rounding noise marked, notes classed.
 */
import type { ProbeOutcome } from '../study/evaluate.ts';
import type { Probe } from '../study/probeSet.ts';
import { headline } from '../study/resultTables.ts';
import { unitLabel } from '../study/units.ts';
import { classifyNotes, type ResultNote } from '../ui/notes.ts';
import type { ProbeKind, ProbeResult } from '../ui/results.ts';
import { assignNoiseScales, type NoiseContext } from '../ui/roundingNoise.ts';

/** The table's kind of each probe-set kind. */
export const KIND: Record<Probe['kind'], ProbeKind> = {
  'cut-plane': 'plane', line: 'line', point: 'point', force: 'force', 'pressure-loss': 'pressure-loss', 'mass-balance': 'mass-balance', wall: 'wall', iso: 'iso',
};

export interface OutcomeResultOptions {
  /** Keys shown on the pin, in this order (those the outcome has); default: the study's headline two. */
  pinned?: readonly string[];
  /** Relabels quantities by key (e.g. to say which plane's dynamic pressure K used). */
  labels?: Readonly<Record<string, string>>;
  /** Appended to the definition; default " — evaluated from the probe set". */
  origin?: string;
  /** Extra notes placed first. */
  notes?: readonly ResultNote[];
  /** A short line the pin shows under its numbers (see `ProbeResult.tag`). */
  tag?: string;
  /** The mesh's field magnitudes and density for the rounding-noise scales of points and cut-planes (`roundingNoise.ts`). */
  noise?: NoiseContext;
}

/** The outcome as a result; `fallbackAnchor` (file length unit) when it has no anchor of its own. */
export function outcomeResult(o: ProbeOutcome, fallbackAnchor: [number, number, number], opts: OutcomeResultOptions = {}): ProbeResult {
  const pinned = new Set(opts.pinned ?? headline(o, 2).map((q) => q.key));
  const notes = [...(o.ok ? [] : [`FAILED: ${o.error}`]), ...o.notes];
  const order = opts.pinned ? (k: string) => { const i = opts.pinned!.indexOf(k); return i < 0 ? opts.pinned!.length : i; } : () => 0;
  const quantities = o.quantities
    .map((q) => ({ key: q.key, label: opts.labels?.[q.key] ?? q.label, value: q.value, unit: unitLabel(q.unit), pinned: pinned.has(q.key), ...(o.scales?.[q.key] ? { scale: { ...o.scales[q.key]! } } : {}) }))
    // pinned ones in the asked order, the rest as the evaluator gave them (a stable sort)
    .sort((a, b) => (a.pinned && b.pinned ? order(a.key) - order(b.key) : 0));
  return {
    id: o.id, kind: KIND[o.kind], label: o.label, anchor: o.anchor ?? fallbackAnchor,
    definition: `${o.definition}${opts.origin ?? ' — evaluated from the probe set'}`, pinVisible: true,
    quantities: assignNoiseScales(KIND[o.kind], quantities, opts.noise),
    ...(notes.length || opts.notes?.length ? { notes: [...(opts.notes ?? []), ...classifyNotes(notes)] } : {}),
    ...(opts.tag ? { tag: opts.tag } : {}),
  };
}
