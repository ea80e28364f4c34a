/**
 * The history pane: a chosen probe quantity plotted against time (the SVG of src/study/historyPlot.ts),
 * computed in the background with progress and Cancel; dragging across the plot sets the statistics
 * window, a button hands the window back to the transient detection; below the plot, the window's
 * statistics (mean ± 95 % half-width with the method named, rms, extremes) and the dominant frequency
 * with its Strouhal number. A toggle shows the spectrum instead of the history.
 */
import './series.css';
import { summarizeHistory, type HistorySummary } from '../stats/historySummary.ts';
import { historySvg, plotTimeOfPixel, spectrumSvg } from '../study/historyPlot.ts';
import { formatNumber, withUnit } from './format.ts';

/** A quantity that can be charted: `key` as the history table names it, with its label and unit. */
export interface HistoryColumn {
  key: string;
  label: string;
  unit: string;
  /** Short name for the plot's value axis (a symbol such as `Q`); default: the label. */
  symbol?: string;
}

export interface HistoryChartEvents {
  /** Compute the history of a column in the background (the chart shows progress until `setHistory`). */
  onCompute: (column: HistoryColumn) => void;
  /** Stop the computation under way. */
  onCancel: () => void;
  /** Another column was chosen (its history may already be at hand). */
  onColumn: (column: HistoryColumn) => void;
  /** The statistics of the charted column changed (new history or new window). */
  onSummary: (column: HistoryColumn, summary: HistorySummary) => void;
}

/** Drags shorter than this (px) are clicks, not windows. */
const MIN_DRAG_PX = 4;

export class HistoryChart {
  readonly el: HTMLDivElement;
  private readonly select: HTMLSelectElement;
  private readonly compute: HTMLButtonElement;
  private readonly auto: HTMLButtonElement;
  private readonly view: HTMLButtonElement;
  private readonly progressRow: HTMLDivElement;
  private readonly progressFill: HTMLDivElement;
  private readonly progressText: HTMLSpanElement;
  private readonly plot: HTMLDivElement;
  private readonly stats: HTMLDivElement;
  private columns: HistoryColumn[] = [];
  /** Key of the column the user chose (kept while the offer changes, e.g. while a step loads). */
  private chosen: string | null = null;
  private data: { column: HistoryColumn; time: Float64Array; values: Float64Array; dropped: number } | null = null;
  private window: { from: number; to: number } | null = null;
  private showSpectrum = false;
  private drag: { x0: number; box: HTMLDivElement } | null = null;
  /** Unit of the series' time (`s`, or `step` when times are step indices). */
  timeUnit = 's';
  /** Reference length (m) and speed (m/s) for the Strouhal number; null: not shown. */
  reference: { length: number; speed: number } | null = null;
  summary: HistorySummary | null = null;

  constructor(host: HTMLElement, private readonly events: HistoryChartEvents) {
    this.el = document.createElement('div');
    this.el.className = 'pane history-pane';
    const head = document.createElement('div');
    head.className = 'pane-head';
    const title = document.createElement('span');
    title.textContent = 'History';
    this.select = document.createElement('select');
    this.select.className = 'history-quantity';
    this.select.title = 'Probe quantity to follow through the steps';
    this.select.onchange = () => { const c = this.columns[this.select.selectedIndex]; if (c) { this.chosen = c.key; this.events.onColumn(c); } };
    const button = (text: string, cls: string, tip: string) => {
      const b = document.createElement('button');
      b.type = 'button'; b.textContent = text; b.className = cls; b.title = tip;
      return b;
    };
    this.compute = button('Compute', 'history-compute', 'Evaluate this quantity at every step (in the background)');
    this.auto = button('Auto window', 'history-auto', 'Start the window where the initial transient ends (MSER-5, White 1997)');
    this.view = button('Spectrum', 'history-view', 'Show the spectrum of the window instead of the history');
    this.compute.onclick = () => { const c = this.columns[this.select.selectedIndex]; if (c) this.events.onCompute(c); };
    this.auto.onclick = () => { this.window = null; this.refresh(); };
    this.view.onclick = () => { this.showSpectrum = !this.showSpectrum; this.view.textContent = this.showSpectrum ? 'History' : 'Spectrum'; this.draw(); };
    head.append(title, this.select, this.compute, this.auto, this.view);

    this.progressRow = document.createElement('div');
    this.progressRow.className = 'history-progress';
    this.progressRow.hidden = true;
    const bar = document.createElement('div');
    bar.className = 'bar';
    this.progressFill = document.createElement('div');
    bar.append(this.progressFill);
    this.progressText = document.createElement('span');
    const cancel = button('Cancel', 'history-cancel', 'Stop computing the history');
    cancel.onclick = () => this.events.onCancel();
    this.progressRow.append(bar, this.progressText, cancel);

    this.plot = document.createElement('div');
    this.plot.className = 'history-plot';
    this.plot.addEventListener('pointerdown', (e) => this.dragStart(e));
    this.plot.addEventListener('pointermove', (e) => this.dragMove(e));
    this.plot.addEventListener('pointerup', (e) => this.dragEnd(e));
    this.stats = document.createElement('div');
    this.stats.className = 'history-stats';
    this.el.append(head, this.progressRow, this.plot, this.stats);
    host.append(this.el);
    new ResizeObserver(() => this.draw()).observe(this.plot);
    this.setColumns([]);
  }

  /** Offers the quantities that can be charted; keeps the chosen one when still offered. */
  setColumns(columns: HistoryColumn[]): void {
    this.columns = columns;
    this.select.replaceChildren(...columns.map((c) => new Option(c.unit ? `${c.label} [${c.unit}]` : c.label, c.key)));
    const keep = columns.findIndex((c) => c.key === this.chosen);
    this.select.selectedIndex = keep >= 0 ? keep : 0;
    this.compute.disabled = columns.length === 0;
    if (!this.data) this.empty(columns.length ? 'Choose a quantity and press Compute to follow it through the steps.' : 'Place a probe to chart its history through the steps.');
  }

  /** Shows the background computation's progress (steps done of total). */
  progress(done: number, total: number): void {
    this.progressRow.hidden = false;
    this.el.dataset['busy'] = 'true';
    this.progressFill.style.width = `${total > 0 ? ((100 * done) / total).toFixed(1) : 0}%`;
    this.progressText.textContent = `step ${done} of ${total}`;
    if (!this.data) this.empty('Computing the history in the background; the view stays usable.');
  }

  /** Ends the progress display (finished, cancelled or failed: `message` says which when not finished). */
  done(message?: string): void {
    this.progressRow.hidden = true;
    this.el.dataset['busy'] = 'false';
    if (message) this.stats.replaceChildren(line(message, 'note'));
  }

  /**
   * A computed history of a column: plots it and computes its statistics over the current window. Steps
   * where the probe gave no value (NaN) are left out and counted in a note.
   */
  setHistory(column: HistoryColumn, time: Float64Array, values: Float64Array): void {
    this.done();
    if (this.data?.column.key !== column.key) this.window = null;
    let kept = 0;
    for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i]!)) kept++;
    const t = new Float64Array(kept), v = new Float64Array(kept);
    for (let i = 0, k = 0; i < values.length; i++) if (Number.isFinite(values[i]!)) { t[k] = time[i]!; v[k++] = values[i]!; }
    this.chosen = column.key;
    const i = this.columns.findIndex((c) => c.key === column.key);
    if (i >= 0) this.select.selectedIndex = i;
    this.data = { column, time: t, values: v, dropped: values.length - kept };
    if (kept === 0) { this.empty(`${column.label}: no step gave a value.`); return; }
    this.refresh();
  }

  /** The column charted, if any. */
  get column(): HistoryColumn | null {
    return this.data?.column ?? null;
  }

  /** Sets the statistics window (time unit of the series); null hands it back to the transient detection. */
  setWindow(w: { from: number; to: number } | null): void {
    this.window = w;
    this.refresh();
  }

  /** Forgets the history (a new series was opened). */
  clear(): void {
    this.data = null;
    this.chosen = null;
    this.summary = null;
    this.window = null;
    this.done();
    this.setColumns(this.columns);
  }

  private refresh(): void {
    const d = this.data;
    if (!d || d.time.length === 0) return;
    try {
      const ref = this.reference;
      this.summary = summarizeHistory(d.time, d.values, {
        ...(this.window ? { from: this.window.from, to: this.window.to } : {}),
        ...(ref ? { referenceLength: ref.length, referenceSpeed: ref.speed } : {}),
        label: d.column.label,
      });
    } catch (e) {
      this.summary = null;
      this.draw();
      this.stats.replaceChildren(line((e as Error).message, 'note'));
      return;
    }
    // the window in full precision, for tests and for anyone reading the page
    this.el.dataset['from'] = String(this.summary.stats.from);
    this.el.dataset['to'] = String(this.summary.stats.to);
    this.draw();
    this.writeStats();
    this.events.onSummary(d.column, this.summary);
  }

  private draw(): void {
    const d = this.data;
    if (!d || d.time.length === 0) return;
    const width = Math.max(240, this.plot.clientWidth || 480), height = Math.max(140, this.plot.clientHeight || 200);
    const s = this.summary;
    if (this.showSpectrum && !s?.spectrum) {
      this.plot.replaceChildren(Object.assign(document.createElement('div'), {
        className: 'history-empty', textContent: 'No spectrum: the window holds fewer than 8 steps, or the values do not vary.',
      }));
      return;
    }
    if (this.showSpectrum && s?.spectrum) {
      const sp = s.spectrum;
      this.plot.innerHTML = spectrumSvg({
        frequencies: sp.frequencies, power: sp.power, quantity: d.column.symbol ?? d.column.label, title: `spectrum of ${d.column.label}`, unit: d.column.unit, width, height,
        peak: { frequency: sp.frequency, amplitude: sp.amplitude, ...(s.strouhal !== null ? { strouhal: s.strouhal } : {}) },
      });
      return;
    }
    this.plot.innerHTML = historySvg({
      time: d.time, values: d.values, quantity: d.column.label, unit: d.column.unit, timeUnit: this.timeUnit, width, height,
      ...(d.column.symbol ? { axisName: d.column.symbol } : {}),
      ...(s ? { window: { from: s.stats.from, to: s.stats.to }, mean: s.stats.mean, halfWidth95: s.stats.meanUncertainty.halfWidth95, transientEnd: s.transient.time } : {}),
    });
  }

  private writeStats(): void {
    const s = this.summary, d = this.data;
    if (!s || !d) return;
    const u = d.column.unit, st = s.stats, mu = st.meanUncertainty;
    const rows = [
      line(`mean ${formatNumber(st.mean)} ± ${withUnit(mu.halfWidth95, u, 2)} (95 %)`, 'mean'),
      line(`rms fluctuation ${withUnit(st.rmsFluctuation, u)} · std ${withUnit(st.std, u)} · min ${withUnit(st.min, u)} · max ${withUnit(st.max, u)}`, 'spread'),
      line(`window ${formatNumber(st.from)}–${formatNumber(st.to)} ${this.timeUnit}, ${st.samples} steps, ${s.windowSource === 'user' ? 'set by hand' : `start by ${s.transient.method}`}`, 'window'),
      line(`uncertainty: ${mu.method}; integral time ${formatNumber(mu.integralTime)} ${this.timeUnit}, ${formatNumber(mu.effectiveSamples, 3)} effective samples`, 'method'),
    ];
    if (s.spectrum) {
      rows.push(line(`dominant frequency ${formatNumber(s.spectrum.frequency)} Hz (resolution ${formatNumber(s.spectrum.resolution, 2)} Hz), amplitude ${withUnit(s.spectrum.amplitude, u)}${s.strouhal !== null ? `, St = ${formatNumber(s.strouhal)}` : ''}`, 'frequency'));
    }
    const dropped = d.dropped ? `${d.dropped} step${d.dropped === 1 ? '' : 's'} without a value left out` : undefined;
    for (const n of [dropped, s.transient.note, s.windowNote, mu.note, s.spectrum?.note]) if (n) rows.push(line(n, 'note'));
    this.stats.replaceChildren(...rows);
  }

  private empty(text: string): void {
    this.plot.replaceChildren();
    const p = document.createElement('div');
    p.className = 'history-empty';
    p.textContent = text;
    this.stats.replaceChildren(p);
  }

  /** x of a screen position in the plot svg's own units. */
  private svgX(svg: SVGSVGElement, clientX: number): number {
    const r = svg.getBoundingClientRect();
    return ((clientX - r.left) / r.width) * svg.viewBox.baseVal.width;
  }

  private dragStart(e: PointerEvent): void {
    if (!this.data || this.showSpectrum || e.button !== 0) return;
    const box = document.createElement('div');
    box.className = 'history-drag';
    this.plot.append(box);
    this.drag = { x0: e.clientX, box };
    this.plot.setPointerCapture(e.pointerId);
    this.dragMove(e);
  }

  private dragMove(e: PointerEvent): void {
    if (!this.drag) return;
    const r = this.plot.getBoundingClientRect();
    const a = Math.min(this.drag.x0, e.clientX) - r.left, b = Math.max(this.drag.x0, e.clientX) - r.left;
    this.drag.box.style.left = `${a}px`;
    this.drag.box.style.width = `${b - a}px`;
  }

  private dragEnd(e: PointerEvent): void {
    const drag = this.drag;
    if (!drag) return;
    this.drag = null;
    drag.box.remove();
    const svg = this.plot.querySelector('svg');
    const pixels = svg?.getAttribute('data-x-pixels'), range = svg?.getAttribute('data-x-range');
    if (!svg || !pixels || !range || Math.abs(e.clientX - drag.x0) < MIN_DRAG_PX) return;
    const xa = this.svgX(svg, Math.min(drag.x0, e.clientX)), xb = this.svgX(svg, Math.max(drag.x0, e.clientX));
    const [t0, t1] = range.split(' ').map(Number) as [number, number];
    const from = Math.max(plotTimeOfPixel({ pixels, range }, xa), t0), to = Math.min(plotTimeOfPixel({ pixels, range }, xb), t1);
    if (to > from) this.setWindow({ from, to });
  }
}

function line(text: string, cls: string): HTMLDivElement {
  const d = document.createElement('div');
  d.className = cls;
  d.textContent = text;
  return d;
}
