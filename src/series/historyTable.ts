/**
 * A history table: the time of every step and one column per probe quantity, named exactly as
 * `results.csv` names its columns (`<probe id>.<quantity> [unit]`), built step by step from probe-set
 * evaluations, and written as CSV. A quantity a step could not give (its probe failed there) is NaN in
 * the table and an empty cell in the CSV, never a zero; the failures are listed with their steps.
 */
import type { SetEvaluation } from '../study/evaluate.ts';
import { UNITS_STATEMENT, type TableContext } from '../study/resultTables.ts';
import { timeSourceStatement, timeUnit, type TimeSource } from './seriesIndex.ts';

/** One probe quantity over time. */
export interface HistoryColumn {
  probe: string;
  /** Quantity key within the probe, e.g. `massFlowRate`. */
  key: string;
  /** SI unit of the values (`1` for dimensionless). */
  unit: string;
  /** Column name, as in results.csv: `<probe>.<key> [unit]`. */
  name: string;
  /** Short label with symbol (e.g. `ṁ`) of the quantity. */
  label: string;
  /** One value per step (unit above); NaN where the step gave none. */
  values: Float64Array;
}

/** Every probe quantity of a probe set over the steps of a series. */
export interface HistoryTable {
  /** The series' name (collection file, folder or pattern). */
  series: string;
  timeSource: TimeSource;
  /** `s` for times, `step` for step indices. */
  timeUnit: string;
  /** Step times (time unit), strictly increasing. */
  time: Float64Array;
  /** Source name of each step's dataset (file name or `… (n parts)`). */
  stepNames: string[];
  columns: HistoryColumn[];
  /** `step file: probe — message` for every probe that failed at some step. */
  failures: string[];
  /** Steps read, and of those how many reused the previous step's mesh (its cell tree and boundary faces). */
  meshReuse: { steps: number; reused: number };
}

/** Column name of a quantity, as results.csv writes it. */
export const columnName = (probe: string, key: string, unit: string): string => `${probe}.${key} [${unit}]`;

/** Collects evaluations step by step into a history table. */
export class HistoryBuilder {
  private readonly times: number[] = [];
  private readonly names: string[] = [];
  private readonly cols = new Map<string, { probe: string; key: string; unit: string; label: string; values: number[] }>();
  private readonly failures: string[] = [];
  private reused = 0;

  constructor(private readonly series: string, private readonly timeSource: TimeSource) {}

  /** Adds one step's evaluation at `time`. */
  add(time: number, evaluation: SetEvaluation, meshReused: boolean): void {
    const n = this.times.length;
    this.times.push(time);
    this.names.push(evaluation.source);
    if (meshReused) this.reused++;
    for (const p of evaluation.probes) {
      if (!p.ok) this.failures.push(`${evaluation.source} (t = ${time}): ${p.label} [${p.id}] — ${p.error}`);
      for (const q of p.quantities) {
        const id = `${p.id}\u0000${q.key}`;
        let c = this.cols.get(id);
        if (!c) { c = { probe: p.id, key: q.key, unit: q.unit, label: q.label, values: new Array<number>(n).fill(NaN) }; this.cols.set(id, c); }
        c.values.push(q.value);
      }
    }
    for (const c of this.cols.values()) if (c.values.length === n) c.values.push(NaN);
  }

  /** The table so far. */
  table(): HistoryTable {
    return {
      series: this.series, timeSource: this.timeSource, timeUnit: timeUnit(this.timeSource),
      time: Float64Array.from(this.times), stepNames: [...this.names],
      columns: [...this.cols.values()].map((c) => ({ probe: c.probe, key: c.key, unit: c.unit, label: c.label, name: columnName(c.probe, c.key, c.unit), values: Float64Array.from(c.values) })),
      failures: [...this.failures], meshReuse: { steps: this.times.length, reused: this.reused },
    };
  }
}

const cell = (s: string): string => (/[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

/** Comment lines every history output starts with (without the leading `# `). */
export function historyPreamble(t: HistoryTable, ctx: TableContext): string[] {
  const n = t.time.length;
  return [
    `${ctx.tool} ${ctx.version} history${ctx.probeSet ? ` of the probe set "${ctx.probeSet}"` : ''} over the series "${t.series}"; created ${ctx.createdAt}`,
    `Time source: ${t.timeSource} — ${timeSourceStatement(t.timeSource)}; ${n} step${n === 1 ? '' : 's'}${n ? ` from ${t.time[0]} to ${t.time[n - 1]} ${t.timeUnit}` : ''}`,
    `Mesh read and its cell tree and boundary faces built ${t.meshReuse.steps - t.meshReuse.reused} time(s); reused for ${t.meshReuse.reused} of ${t.meshReuse.steps} steps (identical geometry bytes)`,
    UNITS_STATEMENT,
    `Caution: ${ctx.caution}`,
  ];
}

/** The table as CSV: `#` comment lines, then `time [s]`, `step file` and one column per quantity. */
export function historyCsv(t: HistoryTable, ctx: TableContext): string {
  const rows = historyPreamble(t, ctx).map((l) => `# ${l}`);
  for (const f of t.failures) rows.push(`# failed: ${f}`);
  rows.push([`time [${t.timeUnit}]`, 'step file', ...t.columns.map((c) => c.name)].map(cell).join(','));
  for (let i = 0; i < t.time.length; i++) {
    rows.push([String(t.time[i]), t.stepNames[i]!, ...t.columns.map((c) => (Number.isNaN(c.values[i]!) ? '' : String(c.values[i])))].map(cell).join(','));
  }
  return rows.join('\n') + '\n';
}
