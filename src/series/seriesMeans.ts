/**
 * A series as one row beside single files: the window mean of every history column as a probe-set
 * evaluation (so `report` tables and `compare` take it like a file's numbers), and a comparison of two
 * series' means with each side's 95 % half-width and whether the difference stands out from them.
 * The test |Δ| > √(h_b² + h_v²) (half-widths combined in quadrature, as for independent means) is common
 * practice, not a formal hypothesis test: it says whether the difference is larger than the sampling
 * uncertainty of the two means, nothing about the simulations' own errors.
 */
import type { Comparison, ComparedQuantity } from '../study/compare.ts';
import { compareEvaluations } from '../study/compare.ts';
import type { SetEvaluation } from '../study/evaluate.ts';
import type { ProbeOutcome, ResolvedReference } from '../study/outcome.ts';
import { sig6 } from '../study/resultTables.ts';
import type { ColumnSummary } from './historyStats.ts';
import type { HistoryTable } from './historyTable.ts';
import { timeSourceStatement } from './seriesIndex.ts';

/** The window means of a history as an evaluation named `source` (failed probes carry the summaries' reasons). */
export function meanEvaluation(t: HistoryTable, summaries: readonly ColumnSummary[], source: string, reference: ResolvedReference, lengthUnit: string): SetEvaluation {
  const probes = new Map<string, ProbeOutcome>();
  for (const s of summaries) {
    let p = probes.get(s.column.probe);
    if (!p) {
      p = { id: s.column.probe, kind: 'point', label: s.column.probe, ok: true, error: null, quantities: [], notes: [], anchor: null,
        definition: `time mean over the series "${t.series}" (${timeSourceStatement(t.timeSource)})` };
      probes.set(s.column.probe, p);
    }
    const m = s.summary;
    if (!m) { p.ok = false; p.error ??= s.error; continue; }
    p.quantities.push({ key: s.column.key, label: s.column.label, value: m.stats.mean, unit: s.column.unit });
    if (p.notes.length === 0) {
      p.notes.push(`time mean over ${sig6(m.stats.from)} … ${sig6(m.stats.to)} ${t.timeUnit} (${m.windowSource === 'user' ? 'window given' : `after the transient detected by ${m.transient.method}`}); uncertainty of each mean in the statistics table`);
    }
  }
  const list = [...probes.values()];
  return { source, probes: list, failed: list.filter((p) => !p.ok).length, lengthUnit, reference };
}

/** A compared quantity of two series: the means, and each side's 95 % half-width. */
export interface SeriesComparedQuantity extends ComparedQuantity {
  baselineHalfWidth95: number | null;
  variantHalfWidth95: number | null;
  /** |difference| > √(h_b² + h_v²) (common practice; see the file comment); null when a side is missing. */
  exceedsUncertainty: boolean | null;
}

/** The window means of two series side by side (see the file comment). */
export function compareSeries(
  base: { table: HistoryTable; summaries: readonly ColumnSummary[]; name: string },
  vari: { table: HistoryTable; summaries: readonly ColumnSummary[]; name: string },
  reference: ResolvedReference, lengthUnit: string,
): Omit<Comparison, 'rows'> & { rows: SeriesComparedQuantity[] } {
  const c = compareEvaluations(meanEvaluation(base.table, base.summaries, base.name, reference, lengthUnit), meanEvaluation(vari.table, vari.summaries, vari.name, reference, lengthUnit),
    { baseline: base.name, variant: vari.name });
  const hw = (list: readonly ColumnSummary[], probe: string, key: string) => list.find((s) => s.column.probe === probe && s.column.key === key)?.summary?.stats.meanUncertainty.halfWidth95 ?? null;
  const rows = c.rows.map((r) => {
    const hb = hw(base.summaries, r.probe, r.key), hv = hw(vari.summaries, r.probe, r.key);
    const exceeds = r.difference !== null && hb !== null && hv !== null ? Math.abs(r.difference) > Math.hypot(hb, hv) : null;
    return { ...r, baselineHalfWidth95: hb, variantHalfWidth95: hv, exceedsUncertainty: exceeds };
  });
  return { ...c, rows };
}
