/**
 * The same probe set on a baseline and a variant, side by side: per probe and quantity both values, the
 * absolute difference (variant − baseline, in the quantity's unit) and the relative difference
 * ((variant − baseline)/|baseline|, a fraction). Quantities matched by probe id and key. A quantity that
 * one side lacks, or a probe that failed on one side, is listed with the other side empty and a note —
 * never as a zero difference. The relative difference is left out when the baseline is zero.
 */
import type { SetEvaluation } from './evaluate.ts';
import { sig6 } from './resultTables.ts';
import { unitLabel } from './units.ts';

export interface ComparedQuantity {
  probe: string;
  probeLabel: string;
  key: string;
  label: string;
  unit: string;
  baseline: number | null;
  variant: number | null;
  /** variant − baseline (unit of the quantity). */
  difference: number | null;
  /** (variant − baseline)/|baseline| (fraction). */
  relative: number | null;
  note: string | null;
}

export interface Comparison {
  baseline: string;
  variant: string;
  rows: ComparedQuantity[];
  /** `side: probe — message` for probes that failed on either side. */
  failures: string[];
}

/** Compares two evaluations of the same probe set. */
export function compareEvaluations(baseline: SetEvaluation, variant: SetEvaluation, names = { baseline: baseline.source, variant: variant.source }): Comparison {
  const rows: ComparedQuantity[] = [];
  const failures: string[] = [];
  const ids = [...baseline.probes.map((p) => p.id), ...variant.probes.map((p) => p.id).filter((id) => !baseline.probes.some((p) => p.id === id))];
  for (const id of ids) {
    const b = baseline.probes.find((p) => p.id === id), v = variant.probes.find((p) => p.id === id);
    if (b && !b.ok) failures.push(`baseline ${names.baseline}: ${b.label} [${id}] — ${b.error}`);
    if (v && !v.ok) failures.push(`variant ${names.variant}: ${v.label} [${id}] — ${v.error}`);
    const keys: { key: string; label: string; unit: string }[] = [];
    for (const q of [...(b?.quantities ?? []), ...(v?.quantities ?? [])]) if (!keys.some((k) => k.key === q.key)) keys.push(q);
    for (const k of keys) {
      const qb = b?.quantities.find((q) => q.key === k.key), qv = v?.quantities.find((q) => q.key === k.key);
      const base = qb?.value ?? null, vari = qv?.value ?? null;
      let note: string | null = null;
      if (base === null) note = b ? (b.ok ? 'not given on the baseline' : `baseline failed: ${b.error}`) : 'probe not on the baseline';
      else if (vari === null) note = v ? (v.ok ? 'not given on the variant' : `variant failed: ${v.error}`) : 'probe not on the variant';
      if (qb && qv && qb.unit !== qv.unit) note = `units differ: ${qb.unit} vs ${qv.unit}`;
      const difference = base !== null && vari !== null && !(qb && qv && qb.unit !== qv.unit) ? vari - base : null;
      const relative = difference !== null && base !== 0 ? difference / Math.abs(base!) : null;
      if (difference !== null && base === 0 && note === null) note = 'baseline is zero: no relative difference';
      rows.push({ probe: id, probeLabel: (b ?? v)!.label, key: k.key, label: k.label, unit: qb?.unit ?? qv?.unit ?? k.unit, baseline: base, variant: vari, difference, relative, note });
    }
  }
  return { baseline: names.baseline, variant: names.variant, rows, failures };
}

const cell = (s: string): string => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
const n = (v: number | null): string => (v === null ? '' : String(v));

/** CSV: one row per compared quantity; comment lines give the files, units and caution. */
export function comparisonCsv(c: Comparison, caution: string): string {
  return [
    `# baseline: ${c.baseline}; variant: ${c.variant}; difference = variant − baseline (unit of the quantity); relative = difference / |baseline| (fraction)`,
    `# Caution: ${caution}`,
    'probe,label,quantity,symbol,unit,baseline,variant,difference,relative,note',
    ...c.rows.map((r) => [r.probe, r.probeLabel, r.key, r.label, r.unit, n(r.baseline), n(r.variant), n(r.difference), n(r.relative), r.note ?? ''].map(cell).join(',')),
  ].join('\n') + '\n';
}

/** Relative difference as a signed percentage text. */
export function percent(v: number | null): string {
  if (v === null) return '—';
  const p = 100 * v;
  return `${p > 0 ? '+' : ''}${Math.abs(p) >= 0.01 || p === 0 ? p.toFixed(2) : p.toExponential(2)} %`;
}

/** Aligned text table. */
export function comparisonText(c: Comparison): string[] {
  const lines = [`baseline: ${c.baseline}`, `variant:  ${c.variant}`, ''];
  const w = Math.max(20, ...c.rows.map((r) => r.label.length + unitLabel(r.unit).length + 3));
  lines.push(`${'quantity'.padEnd(w)} ${'baseline'.padStart(13)} ${'variant'.padStart(13)} ${'difference'.padStart(13)} ${'relative'.padStart(10)}`);
  let probe = '';
  for (const r of c.rows) {
    if (r.probe !== probe) { probe = r.probe; lines.push(`${r.probeLabel} [${r.probe}]`); }
    const u = unitLabel(r.unit);
    const q = (v: number | null) => (v === null ? '—' : sig6(v)).padStart(13);
    lines.push(`  ${`${r.label}${u ? ` [${u}]` : ''}`.padEnd(w - 2)} ${q(r.baseline)} ${q(r.variant)} ${q(r.difference)} ${percent(r.relative).padStart(10)}${r.note ? `   (${r.note})` : ''}`);
  }
  return lines;
}
