/**
 * The line-probe chart (uPlot): one field along the arc length, samples outside the mesh shown as
 * gaps, with a field choice and a CSV download of every sampled column.
 */
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { addCautionLine } from './cautionLine.ts';

/** One column of a line probe for the chart: a scalar, or one component/the magnitude of a vector. */
export interface ChartSeries {
  /** e.g. `velocity (z)`. */
  label: string;
  unit: string;
  /** Values per sample; NaN where the sample is outside the mesh. */
  values: Float64Array;
}

export interface ChartData {
  title: string;
  /** Arc length from the line's start, per sample (m). */
  s: Float64Array;
  series: ChartSeries[];
}

export class LineChart {
  private plot: uPlot | undefined;
  private data: ChartData | undefined;
  private chosen = 0;
  private readonly select: HTMLSelectElement;
  private readonly plotHost: HTMLDivElement;
  readonly download: HTMLButtonElement;

  constructor(host: HTMLElement) {
    const head = document.createElement('div');
    head.className = 'pane-head';
    const title = document.createElement('span');
    title.textContent = 'Line probe';
    this.select = document.createElement('select');
    this.select.className = 'chart-field';
    this.select.onchange = () => { this.chosen = this.select.selectedIndex; this.draw(); };
    this.select.hidden = true;
    this.download = document.createElement('button');
    this.download.type = 'button';
    this.download.textContent = 'Download CSV';
    this.download.className = 'chart-csv';
    this.download.disabled = true;
    head.append(title, this.select, this.download);
    this.plotHost = document.createElement('div');
    this.plotHost.className = 'chart';
    host.append(head, this.plotHost);
    addCautionLine(host);
    new ResizeObserver(() => this.resize()).observe(this.plotHost);
  }

  /** Shows a line probe's samples; keeps the chosen field when the new data has it. */
  set(data: ChartData | undefined): void {
    const prev = this.data?.series[this.chosen]?.label;
    this.data = data;
    this.select.replaceChildren(...(data?.series ?? []).map((s) => new Option(s.unit ? `${s.label} [${s.unit}]` : s.label)));
    const keep = data?.series.findIndex((s) => s.label === prev) ?? -1;
    this.chosen = keep >= 0 ? keep : 0;
    this.select.selectedIndex = this.chosen;
    this.download.disabled = !data;
    this.select.hidden = !data;
    this.draw();
  }

  private resize(): void {
    if (this.plot) this.plot.setSize({ width: this.plotHost.clientWidth, height: Math.max(80, this.plotHost.clientHeight) });
  }

  private draw(): void {
    this.plot?.destroy();
    this.plot = undefined;
    const d = this.data, s = d?.series[this.chosen];
    if (!d || !s) return;
    const y = Array.from(s.values, (v) => (Number.isFinite(v) ? v : null));
    this.plot = new uPlot({
      width: this.plotHost.clientWidth || 400,
      height: Math.max(80, this.plotHost.clientHeight || 160),
      legend: { show: false },
      cursor: { drag: { x: false, y: false } },
      scales: { x: { time: false } },
      axes: [
        { label: 'arc length s [m]', stroke: '#374151', grid: { stroke: '#e5e7eb' } },
        { label: s.unit ? `${s.label} [${s.unit}]` : s.label, stroke: '#374151', grid: { stroke: '#e5e7eb' }, size: 64 },
      ],
      series: [{}, { label: s.label, stroke: '#1d4ed8', width: 2, spanGaps: false, points: { show: false } }],
    }, [Array.from(d.s), y], this.plotHost);
  }
}
