/**
 * The results of a probe set on one or more files as tables: JSON (every number at full precision with
 * its unit), CSV with one row per file (a design sweep in one table), CSV with one row per quantity,
 * and aligned text for the terminal. Failed probes appear with their message, never as zeros; every
 * table carries the units and the caution.
 */
import { SIGN_CONVENTION as FORCE_SIGN } from '../surface/forces.ts';
import type { ProbeOutcome, SetEvaluation } from './evaluate.ts';
import { unitLabel } from './units.ts';

/** One evaluated input: the file's name as given and its evaluation. */
export interface FileEvaluation {
  file: string;
  evaluation: SetEvaluation;
}

/** Where the numbers came from, written into every table. */
export interface TableContext {
  tool: string;
  version: string;
  createdAt: string;
  caution: string;
  /** Title of the probe set, if it has one. */
  probeSet?: string;
}

/** The quantities a pin (or a summary column) shows first, per probe kind. */
export const HEADLINE_KEYS: Readonly<Record<string, readonly string[]>> = {
  'cut-plane': ['massFlowRate', 'volumeFlowRate', 'area'],
  line: ['coveredLength', '|velocity|.mean', 'p.mean'],
  point: ['|velocity|', 'p'],
  force: ['CD', 'force.drag', 'CL'],
  'pressure-loss': ['totalPressureLoss', 'lossCoefficient'],
  'mass-balance': ['net', 'imbalanceShare'],
  wall: ['yPlus.mean', 'wallShear.mean'],
  iso: ['area', 'volume'],
};

/** Up to `n` headline quantities of an outcome (its first quantities when none of the headline keys is there). */
export function headline(p: ProbeOutcome, n = 2): ProbeOutcome['quantities'] {
  const keys = HEADLINE_KEYS[p.kind] ?? [];
  const hits = keys.map((k) => p.quantities.find((q) => q.key === k)).filter((q) => q !== undefined);
  return (hits.length ? hits : p.quantities).slice(0, n);
}

/** Units statement of every table. */
export const UNITS_STATEMENT = 'All values SI (m, m², m³/s, kg/s, Pa, N, N·m); unit "1" = dimensionless. Inputs in other units were converted as the probe set declares; undeclared fields were taken as SI ("undeclared" marks a field whose unit is not known).';

/** Sign conventions every report states. */
export const CONVENTIONS: readonly string[] = [
  'Cut-planes: fluxes (Q = ∫u·n dA, ṁ = ∫ρ u·n dA) are positive along the plane normal n; mass-flow-weighted means do not depend on its sign. Total pressure p₀ = p + ½ρ|u|².',
  'Pressure loss: Δp₀ = mass-flow-weighted p₀ upstream − downstream (positive = loss); K = Δp₀/(½ρV²) with V = |Q|/A on the chosen plane.',
  'Mass balance: plane normals point out of the control volume, boundary surfaces out of the fluid; net = Σ outward flux (0 when balanced).',
  `Forces: ${FORCE_SIGN} Coefficients C = F/(½ρU²A) along the drag, lift and side (= lift × drag) directions.`,
  'Line probes: statistics over the samples inside the mesh only (length-weighted means); samples outside are left out, never zeroed.',
  'Wall quantities: τ_w the tangential viscous traction on the wall; c_f = |τ_w|/(½ρU²); y+ = y·√(|τ_w|/ρ)/ν with y as the probe states (wall-cell centroid or first off-wall node); statistics area-weighted.',
  'Iso-surfaces: each cell split into tetrahedra and cut where the linear interpolant equals the value; area of the triangles; enclosed volume (divergence theorem) only for a surface closed on itself, otherwise the count of open edges; colour statistics area-weighted.',
];

/** Failures over all files, as `file: probe — message` lines. */
export function failureLines(files: readonly FileEvaluation[]): string[] {
  const out: string[] = [];
  for (const f of files) for (const p of f.evaluation.probes) if (!p.ok) out.push(`${f.file}: ${p.label} [${p.id}] — ${p.error}`);
  return out;
}

/** The results as a JSON document (full precision). */
export function resultsJson(files: readonly FileEvaluation[], ctx: TableContext, extra: Record<string, unknown> = {}): string {
  return JSON.stringify({
    tool: ctx.tool, version: ctx.version, createdAt: ctx.createdAt, probeSet: ctx.probeSet ?? null,
    units: UNITS_STATEMENT, caution: ctx.caution,
    failed: files.reduce((n, f) => n + f.evaluation.failed, 0),
    files: files.map((f) => ({
      file: f.file, source: f.evaluation.source, lengthUnit: f.evaluation.lengthUnit, reference: f.evaluation.reference, failed: f.evaluation.failed,
      probes: f.evaluation.probes.map((p) => ({
        id: p.id, kind: p.kind, label: p.label, ok: p.ok, error: p.error, definition: p.definition, anchor: p.anchor, notes: p.notes,
        quantities: p.quantities.map((q) => ({ key: q.key, label: q.label, value: q.value, unit: q.unit })),
      })),
    })),
    ...extra,
  }, null, 2) + '\n';
}

const cell = (s: string): string => (/[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

/** Columns of the wide table: every (probe, quantity) in order of first appearance over the files. */
export function wideColumns(files: readonly FileEvaluation[]): { id: string; key: string; unit: string }[] {
  const seen = new Map<string, { id: string; key: string; unit: string }>();
  for (const f of files) for (const p of f.evaluation.probes) for (const q of p.quantities) {
    const k = `${p.id}\u0000${q.key}`;
    if (!seen.has(k)) seen.set(k, { id: p.id, key: q.key, unit: q.unit });
  }
  return [...seen.values()];
}

/**
 * CSV with one row per file: `file`, then one column per probe quantity named `probe.quantity [unit]`,
 * then `failed probes`. Empty cells where a file has no such number. Comment lines (`#`) give the
 * context, units and caution.
 */
export function resultsCsvByFile(files: readonly FileEvaluation[], ctx: TableContext): string {
  const cols = wideColumns(files);
  const rows = [
    `# ${ctx.tool} ${ctx.version} results${ctx.probeSet ? ` of the probe set "${ctx.probeSet}"` : ''}; created ${ctx.createdAt}`,
    `# ${UNITS_STATEMENT}`,
    `# Caution: ${ctx.caution}`,
    ['file', ...cols.map((c) => `${c.id}.${c.key} [${c.unit}]`), 'failed probes'].map(cell).join(','),
  ];
  for (const f of files) {
    const byKey = new Map<string, number>();
    for (const p of f.evaluation.probes) for (const q of p.quantities) byKey.set(`${p.id}\u0000${q.key}`, q.value);
    const failed = f.evaluation.probes.filter((p) => !p.ok).map((p) => `${p.id}: ${p.error}`).join('; ');
    rows.push([f.file, ...cols.map((c) => { const v = byKey.get(`${c.id}\u0000${c.key}`); return v === undefined ? '' : String(v); }), failed].map(cell).join(','));
  }
  return rows.join('\n') + '\n';
}

/** CSV with one row per file, probe and quantity (failed probes get a row with their message). */
export function resultsCsvLong(files: readonly FileEvaluation[], ctx: TableContext): string {
  const rows = [
    `# ${ctx.tool} ${ctx.version} results; created ${ctx.createdAt}`,
    `# ${UNITS_STATEMENT}`,
    `# Caution: ${ctx.caution}`,
    'file,probe,kind,label,status,quantity,symbol,value,unit,message',
  ];
  for (const f of files) for (const p of f.evaluation.probes) {
    const status = p.ok ? 'ok' : 'failed';
    for (const q of p.quantities) rows.push([f.file, p.id, p.kind, p.label, status, q.key, q.label, String(q.value), q.unit, ''].map(cell).join(','));
    if (!p.ok) rows.push([f.file, p.id, p.kind, p.label, status, '', '', '', '', p.error ?? ''].map(cell).join(','));
  }
  return rows.join('\n') + '\n';
}

/** A number with 6 significant figures for text tables. */
export function sig6(v: number): string {
  if (!Number.isFinite(v)) return '—';
  if (v === 0) return '0';
  const a = Math.abs(v);
  return a >= 1e-3 && a < 1e6 ? String(Number(v.toPrecision(6))) : v.toExponential(5);
}

/** Aligned text: per probe, its quantities with a column per file. */
export function resultsText(files: readonly FileEvaluation[]): string[] {
  const lines: string[] = [];
  const first = files[0]?.evaluation.probes ?? [];
  const names = files.map((f) => f.file.split('/').pop()!);
  for (const p0 of first) {
    lines.push(`${p0.label} [${p0.id}, ${p0.kind}]`);
    const outs = files.map((f) => f.evaluation.probes.find((p) => p.id === p0.id)!);
    const keys: { key: string; label: string; unit: string }[] = [];
    for (const o of outs) for (const q of o.quantities) if (!keys.some((k) => k.key === q.key)) keys.push(q);
    const lw = Math.max(12, ...keys.map((k) => k.label.length + unitLabel(k.unit).length + 3));
    const cw = Math.max(12, ...names.map((n) => n.length));
    if (files.length > 1) lines.push(`  ${''.padEnd(lw)} ${names.map((n) => n.padStart(cw)).join(' ')}`);
    for (const k of keys) {
      const u = unitLabel(k.unit);
      const vals = outs.map((o) => { const q = o.quantities.find((x) => x.key === k.key); return q ? sig6(q.value) : '—'; });
      lines.push(`  ${`${k.label}${u ? ` [${u}]` : ''}`.padEnd(lw)} ${vals.map((v) => v.padStart(cw)).join(' ')}`);
    }
    outs.forEach((o, i) => {
      if (!o.ok) lines.push(`  FAILED${files.length > 1 ? ` on ${names[i]}` : ''}: ${o.error}`);
      for (const n of o.notes) lines.push(`  note${files.length > 1 ? ` (${names[i]})` : ''}: ${n}`);
    });
    lines.push('');
  }
  return lines;
}
