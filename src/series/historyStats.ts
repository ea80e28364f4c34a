/**
 * Statistics of every column of a history table over a window (`summarizeHistory` of src/stats: the
 * initial transient by MSER-5 unless the user gave the window start, time-weighted mean, standard
 * deviation, rms fluctuation, min/max, the uncertainty of the mean by its named method, the dominant
 * tone and its Strouhal number f·L/U from the probe set's reference length and speed), and the JSON
 * document of `fieldtally history --json`. A column that cannot be summarised (a gap where a probe
 * failed, too few samples) carries its reason instead of numbers.
 */
import { summarizeHistory, type HistorySummary } from '../stats/historySummary.ts';
import type { ResolvedReference } from '../study/outcome.ts';
import type { TableContext } from '../study/resultTables.ts';
import { UNITS_STATEMENT } from '../study/resultTables.ts';
import type { HistoryColumn, HistoryTable } from './historyTable.ts';
import { timeSourceStatement } from './seriesIndex.ts';

/** The summary of one column, or why there is none. */
export interface ColumnSummary {
  column: HistoryColumn;
  summary: HistorySummary | null;
  error: string | null;
}

/** Window and reference values of the summaries. */
export interface SummaryOptions {
  /** Window (time unit); default from the detected transient end to the last step. */
  from?: number;
  to?: number;
  /** Reference length (m) and speed (m/s) of the Strouhal number. */
  reference?: Pick<ResolvedReference, 'length' | 'speed'>;
}

/** Summaries of every column (see the file comment). */
export function summarizeTable(t: HistoryTable, o: SummaryOptions = {}): ColumnSummary[] {
  return t.columns.map((column) => {
    try {
      const gap = column.values.findIndex((v) => Number.isNaN(v));
      if (gap >= 0) throw new Error(`${column.name}: no value at ${t.stepNames[gap]} (t = ${t.time[gap]}); statistics need a value at every step`);
      const summary = summarizeHistory(t.time, column.values, {
        ...(o.from !== undefined ? { from: o.from } : {}), ...(o.to !== undefined ? { to: o.to } : {}),
        ...(o.reference?.length !== undefined && o.reference.speed !== undefined ? { referenceLength: o.reference.length, referenceSpeed: o.reference.speed } : {}),
        label: column.name,
      });
      return { column, summary, error: null };
    } catch (e) {
      return { column, summary: null, error: (e as Error).message.split('\n')[0]! };
    }
  });
}

/** A summary as plain JSON (the spectrum's arrays left out: the plot and the spectra table carry them). */
export function summaryJson(s: HistorySummary | null): unknown {
  if (!s) return null;
  const sp = s.spectrum;
  return {
    window: { from: s.stats.from, to: s.stats.to, source: s.windowSource },
    transient: s.transient,
    statistics: { samples: s.stats.samples, mean: s.stats.mean, std: s.stats.std, rmsFluctuation: s.stats.rmsFluctuation, min: s.stats.min, max: s.stats.max },
    meanUncertainty: s.stats.meanUncertainty,
    spectrum: sp ? { frequency: sp.frequency, amplitude: sp.amplitude, phase: sp.phase, offset: sp.offset, resolution: sp.resolution, cycles: sp.cycles, method: sp.method, ...(sp.note ? { note: sp.note } : {}) } : null,
    strouhal: s.strouhal,
  };
}

/** The JSON document of a history: the table (full precision), the statistics of every column, units and caution. */
export function historyJson(t: HistoryTable, summaries: readonly ColumnSummary[], ctx: TableContext, extra: Record<string, unknown> = {}): string {
  return JSON.stringify({
    tool: ctx.tool, version: ctx.version, createdAt: ctx.createdAt, probeSet: ctx.probeSet ?? null,
    series: t.series, timeSource: t.timeSource, timeSourceStatement: timeSourceStatement(t.timeSource), timeUnit: t.timeUnit,
    steps: t.time.length, meshReuse: t.meshReuse,
    units: UNITS_STATEMENT, caution: ctx.caution,
    strouhalDefinition: 'St = f·L/U with the dominant frequency f and the probe set\'s reference length L and speed U',
    time: Array.from(t.time), stepNames: t.stepNames,
    columns: summaries.map((s) => ({
      name: s.column.name, probe: s.column.probe, quantity: s.column.key, label: s.column.label, unit: s.column.unit,
      values: Array.from(s.column.values, (v) => (Number.isNaN(v) ? null : v)),
      summary: summaryJson(s.summary), ...(s.error ? { error: s.error } : {}),
    })),
    failures: t.failures,
    ...extra,
  }, null, 2) + '\n';
}

const cell = (s: string): string => (/[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
const num = (v: number | null | undefined): string => (v === null || v === undefined || !Number.isFinite(v) ? '' : String(v));

/** One row per column: window, mean ± 95 % half-width with its method, std, rms fluctuation, min, max, transient end. */
export function statisticsCsv(t: HistoryTable, summaries: readonly ColumnSummary[], ctx: TableContext): string {
  const rows = [
    `# ${ctx.tool} ${ctx.version} statistics over the series "${t.series}"; created ${ctx.createdAt}`,
    `# Time source: ${t.timeSource} — ${timeSourceStatement(t.timeSource)}`,
    `# ${UNITS_STATEMENT}`,
    `# Caution: ${ctx.caution}`,
    ['quantity', 'unit', `window from [${t.timeUnit}]`, `window to [${t.timeUnit}]`, 'window source', 'samples', 'mean', 'mean 95% half-width', 'standard error of the mean',
      'effective samples', 'uncertainty method', 'std', 'rms fluctuation', 'min', 'max', `transient end [${t.timeUnit}]`, 'transient method', 'message'].map(cell).join(','),
  ];
  for (const s of summaries) {
    const m = s.summary;
    rows.push([s.column.name, s.column.unit, num(m?.stats.from), num(m?.stats.to), m?.windowSource ?? '', num(m?.stats.samples), num(m?.stats.mean), num(m?.stats.meanUncertainty.halfWidth95),
      num(m?.stats.meanUncertainty.standardError), num(m?.stats.meanUncertainty.effectiveSamples), m?.stats.meanUncertainty.method ?? '', num(m?.stats.std), num(m?.stats.rmsFluctuation),
      num(m?.stats.min), num(m?.stats.max), num(m?.transient.time), m?.transient.method ?? '', s.error ?? m?.stats.meanUncertainty.note ?? ''].map(cell).join(','));
  }
  return rows.join('\n') + '\n';
}

/** One row per column: dominant frequency, amplitude, resolution, cycles, Strouhal number and method. */
export function spectraCsv(t: HistoryTable, summaries: readonly ColumnSummary[], ctx: TableContext): string {
  const fu = t.timeUnit === 's' ? 'Hz' : '1/step';
  const rows = [
    `# ${ctx.tool} ${ctx.version} dominant frequencies over the series "${t.series}"; created ${ctx.createdAt}`,
    `# Time source: ${t.timeSource} — ${timeSourceStatement(t.timeSource)}; Strouhal number St = f·L/U with the probe set's reference length and speed`,
    `# Caution: ${ctx.caution}`,
    ['quantity', 'unit', `frequency [${fu}]`, 'amplitude', `resolution [${fu}]`, 'cycles in window', 'Strouhal number [1]', 'method', 'message'].map(cell).join(','),
  ];
  for (const s of summaries) {
    const sp = s.summary?.spectrum;
    rows.push([s.column.name, s.column.unit, num(sp?.frequency), num(sp?.amplitude), num(sp?.resolution), num(sp?.cycles), num(s.summary?.strouhal), sp?.method ?? '',
      s.error ?? sp?.note ?? (s.summary && !sp ? 'no dominant tone (constant values or fewer than 8 samples in the window)' : '')].map(cell).join(','));
  }
  return rows.join('\n') + '\n';
}
