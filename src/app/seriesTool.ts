/**
 * Series in the app: files chosen as a series (a `.pvd`, numbered result files, per-step sets) open in the
 * worker (`openSeries`); the time bar over the view shows one step at a time (`showStep`), keeping the
 * camera, colours and probes, which the tools re-evaluate on every step; the history pane evaluates the
 * probe set over every step in the background (`evaluateSeries`, with progress and Cancel) and charts any
 * probe quantity; its window statistics (mean ± 95 % half-width) are pinned beside the probe.
 */
import * as Comlink from 'comlink';
import type { HistoryTable, LoadRequest, SeriesDescription, SeriesProgress } from '../../workers/api.ts';
import type { HistorySummary } from '../stats/historySummary.ts';
import { HistoryChart, type HistoryColumn } from '../ui/historyChart.ts';
import type { ProbeResult } from '../ui/results.ts';
import { TimeControl } from '../ui/timeControl.ts';
import type { ProbeSetTool } from './probeSetTool.ts';
import type { SeriesChoice } from './seriesChoice.ts';
import type { Viewer } from './viewer.ts';

/** Id suffix of the pinned statistics of a probe (`plane-1~time-mean`). */
const STATS_SUFFIX = '~time-mean';

export class SeriesTool {
  private series: SeriesDescription | null = null;
  private choice: SeriesChoice | null = null;
  private table: HistoryTable | null = null;
  private computing = false;
  private pinned: ProbeResult | null = null;
  private replacing = false;
  readonly time: TimeControl;
  readonly chart: HistoryChart;

  constructor(private readonly v: Viewer, private readonly probeSets: ProbeSetTool, hosts: { view: HTMLElement; drawer: HTMLElement }) {
    this.time = new TimeControl(hosts.view, { onStep: async (i) => { await this.show(i); } });
    this.chart = new HistoryChart(hosts.drawer, {
      onCompute: (c) => void this.computeHistory(c),
      onCancel: () => this.v.compute.cancelSeries(),
      onColumn: (c) => this.chartColumn(c),
      onSummary: (c, s) => this.pin(c, s),
    });
    this.chart.el.hidden = true;
    this.chart.el.dataset['pane'] = 'history';
    v.onResultsChanged(() => this.offerColumns());
    // a step replaces every result: the pinned statistics go back once the new step is installed
    v.onBeforeDataset(() => { this.replacing = true; });
    v.onDataset(() => {
      this.replacing = false;
      if (this.pinned) this.v.setResult({ ...this.pinned });
      this.offerColumns();
    });
    v.onResultRemoved((id) => { if (!this.replacing && id === this.pinned?.id) this.pinned = null; });
  }

  /** Whether a series is open. */
  get open(): boolean {
    return this.series !== null;
  }

  /** Opens a series; shows its first step framed like a new file. Errors go to the banner. */
  async openSeries(choice: SeriesChoice): Promise<boolean> {
    try {
      const desc = await this.v.track(this.v.compute.openSeries(choice.files));
      this.close();
      this.series = desc;
      this.choice = choice;
      this.time.setSteps(desc.times, desc.timeSource === 'step-index' ? 'no times in the files' : desc.timeSource === 'collection' ? 'times from the collection' : 'times from TimeValue', desc.timeUnit);
      this.chart.timeUnit = desc.timeUnit;
      this.chart.el.hidden = false;
      this.chart.el.parentElement?.classList.add('with-history');
      this.chart.el.parentElement?.parentElement?.classList.add('with-series');
      document.body.dataset['series'] = String(desc.times.length);
      const shown = await this.show(0, false);
      if (shown) this.v.banner.notice(`Opened the series “${choice.name}”: ${desc.times.length} steps; ${desc.timeSourceStatement}.`);
      this.offerColumns();
      return true;
    } catch (e) {
      this.v.banner.error(`Could not open the series: ${(e as Error).message}`);
      return false;
    }
  }

  /** Forgets the series (another single file is being opened). */
  close(): void {
    if (!this.series) return;
    if (this.computing) this.v.compute.cancelSeries();
    this.series = null;
    this.choice = null;
    this.table = null;
    this.unpin();
    this.time.clear();
    this.chart.clear();
    this.chart.el.hidden = true;
    this.chart.el.parentElement?.classList.remove('with-history');
    this.chart.el.parentElement?.parentElement?.classList.remove('with-series');
    delete document.body.dataset['series'];
  }

  /** Shows step `i` in the view; `keepView` false frames it. */
  private async show(i: number, keepView = true): Promise<boolean> {
    const s = this.series, c = this.choice;
    if (!s || !c) return false;
    const files = s.stepFiles[i] ?? [];
    const main = c.files.find((f) => f.path.endsWith(files[0] ?? '\u0000')) ?? c.files[0]!;
    const request: LoadRequest = { kind: 'files', main, others: c.files.filter((f) => f !== main) };
    try {
      const ok = await this.v.showStep((onProgress) => this.v.compute.showStep(i, Comlink.proxy(onProgress)), request, keepView);
      if (ok) document.body.dataset['step'] = String(i);
      return ok;
    } catch (e) {
      this.v.banner.error(`Could not show step ${i + 1}: ${(e as Error).message}`);
      throw e;
    }
  }

  /** The quantities of the probes in the view, as history columns `<probe id>.<quantity>`. */
  private offerColumns(): void {
    if (!this.series || this.replacing) return;
    const cols: HistoryColumn[] = [];
    for (const r of this.v.allResults) {
      if (r.id.endsWith(STATS_SUFFIX)) continue;
      for (const q of r.quantities) if (Number.isFinite(q.value)) cols.push({ key: `${r.id}.${q.key}`, label: `${r.label}: ${q.label}`, unit: q.unit, symbol: q.label });
    }
    const same = cols.length === this.lastOffered.length && cols.every((c, k) => c.key === this.lastOffered[k]);
    if (!same) { this.lastOffered = cols.map((c) => c.key); this.chart.setColumns(cols); }
  }

  private lastOffered: string[] = [];

  /** Evaluates the probe set over every step (background, progress, cancel), then charts `column`. */
  private async computeHistory(column: HistoryColumn): Promise<void> {
    if (!this.series || this.computing) return;
    this.computing = true;
    const total = this.series.times.length;
    this.chart.progress(0, total);
    try {
      const table = await this.v.compute.evaluateSeries(this.probeSets.currentSet(), undefined, Comlink.proxy((p: SeriesProgress) => this.chart.progress(p.done, p.total)));
      this.table = table;
      this.chart.done();
      if (table.failures.length) this.v.banner.notice(`History: ${table.failures.length} probe evaluation${table.failures.length === 1 ? '' : 's'} failed, e.g. ${table.failures[0]}`);
      this.chartColumn(column);
    } catch (e) {
      const err = e as Error;
      this.chart.done(err.name === 'AbortError' || /cancelled/.test(err.message) ? 'History cancelled.' : `History failed: ${err.message}`);
    } finally {
      this.computing = false;
    }
  }

  /** Charts a column from the computed table (nothing until one is computed). */
  private chartColumn(column: HistoryColumn): void {
    const t = this.table;
    if (!t) return;
    const col = t.columns.find((c) => `${c.probe}.${c.key}` === column.key);
    if (!col) { this.chart.done(`${column.label} is not in the computed history (probes changed since): press Compute.`); return; }
    // the table is in SI: show its unit ('1' means dimensionless)
    this.chart.setHistory({ ...column, unit: col.unit === '1' ? '' : col.unit }, t.time, col.values);
  }

  /** Pins the window mean ± half-width beside the probe of the charted column. */
  private pin(column: HistoryColumn, s: HistorySummary): void {
    const dot = column.key.lastIndexOf('.');
    const probeId = column.key.slice(0, dot), key = column.key.slice(dot + 1);
    const probe = this.v.allResults.find((r) => r.id === probeId);
    if (!probe) return;
    const q = probe.quantities.find((x) => x.key === key);
    const label = q?.label ?? key;
    this.unpin();
    const st = s.stats, mu = st.meanUncertainty;
    this.pinned = {
      id: `${probeId}${STATS_SUFFIX}`,
      kind: probe.kind,
      label: `${probe.label}: time mean`,
      anchor: probe.anchor,
      definition: `${label} over t = ${st.from}…${st.to} ${this.series?.timeUnit ?? 's'} (${st.samples} steps); 95 % half-width by ${mu.method}`,
      quantities: [
        { key: `${key}.mean`, label: `⟨${label}⟩`, value: st.mean, unit: column.unit, pinned: true },
        { key: `${key}.halfWidth95`, label: '± (95 %)', value: mu.halfWidth95, unit: column.unit, pinned: true },
        { key: `${key}.rmsFluctuation`, label: `${label} rms fluctuation`, value: st.rmsFluctuation, unit: column.unit, pinned: false },
        ...(s.spectrum ? [{ key: `${key}.frequency`, label: 'dominant frequency', value: s.spectrum.frequency, unit: this.series?.timeUnit === 's' ? 'Hz' : '1/step', pinned: false }] : []),
        ...(s.strouhal !== null ? [{ key: `${key}.strouhal`, label: 'St', value: s.strouhal, unit: '', pinned: false }] : []),
      ],
      pinVisible: true,
    };
    this.v.setResult({ ...this.pinned });
  }

  private unpin(): void {
    if (this.pinned) this.v.removeResult(this.pinned.id, false);
    this.pinned = null;
  }
}
