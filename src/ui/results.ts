/**
 * The results of the probes placed in the viewer, in one plain model that the pins, the results table
 * and the exports (text, CSV, JSON) all read. Pure: no DOM.
 */
import { CAUTION } from '../study/caution.ts';
import { formatNumber } from './format.ts';
import { notesText, type ResultNote } from './notes.ts';
import { noiseMark, type NoiseScale } from './roundingNoise.ts';

/** `plane`, `line`, `force` come from the view's tools; the others only from a loaded probe set. */
export type ProbeKind = 'plane' | 'line' | 'force' | 'point' | 'pressure-loss' | 'mass-balance' | 'wall' | 'iso';

/** One number of a probe. */
export interface Quantity {
  /** Stable key, e.g. `massFlowRate`, `CD`; used in CSV/JSON and as a DOM data attribute. */
  key: string;
  /** Short label with its symbol, e.g. `ṁ`. */
  label: string;
  /** The value, in `unit`; NaN when it could not be computed (shown as '—'). */
  value: number;
  /** Unit text, e.g. `kg/s`; '' for dimensionless numbers. */
  unit: string;
  /** Shown on the pin (every quantity is in the table). */
  pinned: boolean;
  /** What the value is judged against for rounding noise (`roundingNoise.ts`); none: never marked. */
  scale?: NoiseScale;
}

/** One probe's results. */
export interface ProbeResult {
  /** Stable id, e.g. `plane-1`; pins are laid out in id order. */
  id: string;
  kind: ProbeKind;
  /** Title on the pin and in the table, e.g. `Plane 1`. */
  label: string;
  /** World point the pin's leader line points to (file length units). */
  anchor: [number, number, number];
  /** What the probe is, in words, for exports: position, normal, region, reference values. */
  definition: string;
  quantities: Quantity[];
  /** Notes on the probe (an explanation, or a warning such as "plane misses the mesh"); a pin without numbers shows them. */
  notes?: ResultNote[];
  /** The pin can be hidden without removing the probe. */
  pinVisible: boolean;
  /** A short line the pin shows under its numbers: how a number was got when it matters (e.g. `viscous: wall-shear array "tau"`). */
  tag?: string;
}

/** Context of an export: the file and when. */
export interface ExportContext {
  file: string;
  createdAt: string;
  tool: string;
}

/** The results as aligned plain text (the table's "copy as text"), rounding noise marked, caution included. */
export function resultsAsText(results: readonly ProbeResult[], ctx: ExportContext): string {
  const lines = [`${ctx.tool} results — ${ctx.file} — ${ctx.createdAt}`, ''];
  for (const r of results) {
    lines.push(`${r.label} (${r.definition})`);
    for (const n of r.notes ?? []) lines.push(`  ${n.text}`);
    const w = Math.max(0, ...r.quantities.map((q) => q.label.length));
    for (const q of r.quantities) lines.push(`  ${q.label.padEnd(w)}  ${formatNumber(q.value, 4, true)}${q.unit ? ' ' + q.unit : ''}${noiseMark(q.value, q.scale)}`);
    lines.push('');
  }
  lines.push(`Caution: ${CAUTION}`);
  return lines.join('\n');
}

const csvCell = (s: string): string => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

/**
 * The results as CSV, one row per quantity: `probe,kind,definition,quantity,label,value,unit`.
 * Values carry full double precision (the screen rounds, the file does not). Comment lines starting
 * with `#` give the file and the caution.
 */
export function resultsAsCsv(results: readonly ProbeResult[], ctx: ExportContext): string {
  const rows = [
    `# ${ctx.tool} results; file: ${ctx.file}; created: ${ctx.createdAt}`,
    `# Caution: ${CAUTION}`,
    'probe,kind,definition,quantity,label,value,unit',
  ];
  for (const r of results) {
    for (const q of r.quantities) {
      rows.push([r.label, r.kind, r.definition, q.key, q.label, Number.isFinite(q.value) ? String(q.value) : '', q.unit].map(csvCell).join(','));
    }
    if (r.notes?.length && r.quantities.length === 0) rows.push([r.label, r.kind, r.definition, 'note', notesText(r.notes), '', ''].map(csvCell).join(','));
  }
  return rows.join('\n') + '\n';
}

/** The results as a JSON document (values at full precision; NaN becomes null; `note` all notes, `notes` each with its level). */
export function resultsAsJson(results: readonly ProbeResult[], ctx: ExportContext): string {
  return JSON.stringify({
    tool: ctx.tool,
    file: ctx.file,
    createdAt: ctx.createdAt,
    caution: CAUTION,
    probes: results.map((r) => ({
      id: r.id, kind: r.kind, label: r.label, definition: r.definition, anchor: r.anchor,
      ...(r.notes?.length ? { note: notesText(r.notes), notes: r.notes } : {}),
      quantities: r.quantities.map((q) => ({ key: q.key, label: q.label, value: Number.isFinite(q.value) ? q.value : null, unit: q.unit })),
    })),
  }, null, 2);
}
