/**
 * The line-probe chart (uPlot): one or more fields or components against the arc length, a coordinate or
 * r/L from a chosen point; samples outside the mesh as gaps; the baseline result's same line dashed;
 * measured points from a CSV with their ± bars (on the first series' axis); tick labels distinct at any scale (`axisTicks.ts`), the
 * unit and any shared ×10ⁿ in each axis title; at most two units at once (left and right axes). The y axes'
 * titles are page text in a row above the plot (left axis at the left, right axis at the right), read
 * level and wrapped rather than turned on their side and cut at the plot's height. The
 * pane can be enlarged to half the screen. A CSV download of every sampled column is the line tool's.
 */
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import { addCautionLine } from './cautionLine.ts';
import { axisTitle, sharedExponent, tickLabels } from './axisTicks.ts';
import { DEFAULT_X, xName, xProblem, xValues, type XChoice, type XMeasure } from './chartAxis.ts';
import { parseMeasuredCsv, type MeasuredPoints } from './measuredCsv.ts';

/** One column of a line probe for the chart: a scalar, or one component/the magnitude of a vector. */
export interface ChartSeries {
  /** e.g. `velocity_z`, `|velocity|`. */
  label: string;
  unit: string;
  /** Values per sample; NaN where the sample is outside the mesh. */
  values: Float64Array;
}

export interface ChartData {
  /** The probe's id: measured points and the chosen series are kept per probe. */
  key: string;
  title: string;
  /** Arc length from the line's start and the sample positions (file length unit). */
  s: Float64Array;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  series: ChartSeries[];
  /** The same line on the baseline result, when one was kept. */
  baseline?: { file: string; s: Float64Array; x: Float64Array; y: Float64Array; z: Float64Array; series: ChartSeries[] };
}

/** Line colours of the chart, in order of the series added (our own set, readable on white). */
const PALETTE = ['#1d4ed8', '#b45309', '#047857', '#7c3aed', '#be123c', '#0e7490'];
/** A series whose span is below this fraction of its magnitude is drawn as flat (rounding noise is not zoomed into; common practice). */
const FLAT_FRACTION = 1e-9;

/** Measured points and their bars. */
const MEASURED = '#111827';

const el = <K extends keyof HTMLElementTagNameMap>(tag: K, cls?: string, text?: string): HTMLElementTagNameMap[K] => {
  const e = document.createElement(tag);
  if (cls) e.className = cls;
  if (text !== undefined) e.textContent = text;
  return e;
};

export class LineChart {
  private plot: uPlot | undefined;
  private data: ChartData | undefined;
  /** Labels of the series shown, in order. */
  private shown: string[] = [];
  private x: XChoice = { ...DEFAULT_X, point: [...DEFAULT_X.point] };
  private readonly measured = new Map<string, MeasuredPoints>();
  private readonly select: HTMLSelectElement;
  private readonly chips: HTMLDivElement;
  private readonly xSelect: HTMLSelectElement;
  private readonly xPoint: HTMLInputElement;
  private readonly xLength: HTMLInputElement;
  private readonly measuredInput: HTMLInputElement;
  private readonly message: HTMLDivElement;
  private readonly plotHost: HTMLDivElement;
  /** The y axes' titles above the plot: left axis, right axis. */
  private readonly yTitles: [HTMLSpanElement, HTMLSpanElement];
  readonly download: HTMLButtonElement;
  readonly enlarge: HTMLButtonElement;

  constructor(private readonly host: HTMLElement) {
    const head = el('div', 'pane-head');
    // choosing a field adds it to the chart; a series' × takes it off again
    this.select = el('select', 'chart-field');
    this.select.title = 'add a field or component to the chart';
    this.select.onchange = () => {
      const v = this.select.value;
      if (v && !this.shown.includes(v)) this.shown.push(v);
      this.select.value = '';
      this.draw();
    };
    this.xSelect = el('select', 'chart-x');
    this.xSelect.title = 'what the x axis measures';
    for (const [v, t] of [['s', 'x: arc length'], ['x', 'x: coordinate x'], ['y', 'x: coordinate y'], ['z', 'x: coordinate z'], ['distance', 'x: distance from a point / L']] as const) this.xSelect.append(new Option(t, v));
    this.xSelect.onchange = () => { this.x.measure = this.xSelect.value as XMeasure; this.syncX(); this.draw(); };
    this.xPoint = el('input', 'chart-x-point');
    this.xPoint.placeholder = 'point x, y, z [m]';
    this.xPoint.title = 'distances are measured from this point (file length unit)';
    this.xLength = el('input', 'chart-x-length');
    this.xLength.placeholder = 'L [m]';
    this.xLength.title = 'distances are divided by this length (1: metres)';
    for (const i of [this.xPoint, this.xLength]) i.onchange = () => this.readX();
    const measured = el('button', 'chart-measured', 'Measured CSV…');
    measured.type = 'button';
    measured.title = 'overlay measured points: position (in the x measure shown), value[, ± uncertainty] per row';
    this.measuredInput = el('input');
    this.measuredInput.type = 'file';
    this.measuredInput.accept = '.csv,.txt,text/csv,text/plain';
    this.measuredInput.hidden = true;
    this.measuredInput.className = 'chart-measured-input';
    this.measuredInput.onchange = () => void this.readMeasured();
    measured.onclick = () => this.measuredInput.click();
    this.enlarge = el('button', 'chart-enlarge', 'Enlarge');
    this.enlarge.type = 'button';
    this.enlarge.title = 'give the chart half the screen';
    this.enlarge.onclick = () => this.toggleLarge();
    this.download = el('button', 'chart-csv', 'Download CSV');
    this.download.type = 'button';
    this.download.disabled = true;
    head.append(el('span', undefined, 'Line probe'), this.select, this.xSelect, this.xPoint, this.xLength, measured, this.measuredInput, this.enlarge, this.download);
    this.chips = el('div', 'chart-chips');
    this.message = el('div', 'chart-message');
    this.plotHost = el('div', 'chart');
    this.yTitles = [el('span', 'chart-y-title left'), el('span', 'chart-y-title right')];
    const titles = el('div', 'chart-y-titles');
    titles.append(...this.yTitles);
    host.append(head, this.chips, this.message, titles, this.plotHost);
    addCautionLine(host);
    new ResizeObserver(() => this.resize()).observe(this.plotHost);
    this.syncX();
    this.set(undefined);
  }

  /** Shows a line probe's samples; keeps the chosen series the new data has. */
  set(data: ChartData | undefined): void {
    this.data = data;
    const labels = data?.series.map((s) => s.label) ?? [];
    this.select.replaceChildren(new Option('+ plot a field…', ''), ...(data?.series ?? []).map((s) => new Option(s.unit ? `${s.label} [${s.unit}]` : s.label, s.label)));
    // the chosen series survive a probe removed and re-made on another file (no data in between)
    if (data) this.shown = this.shown.filter((l) => labels.includes(l));
    if (this.shown.length === 0 && labels.length) this.shown = [labels[0]!];
    this.select.value = '';
    this.download.disabled = !data;
    this.select.hidden = !data;
    this.draw();
  }

  /** Measured points shown on the current probe's chart (for tests and reports), or undefined. */
  get measuredPoints(): MeasuredPoints | undefined { return this.data ? this.measured.get(this.data.key) : undefined; }

  private syncX(): void {
    this.xSelect.value = this.x.measure;
    const d = this.x.measure === 'distance';
    this.xPoint.hidden = this.xLength.hidden = !d;
    this.xPoint.value = this.x.point.join(', ');
    this.xLength.value = String(this.x.length);
  }

  private readX(): void {
    const p = this.xPoint.value.split(/[,;\s]+/).filter(Boolean).map(Number);
    const c: XChoice = { measure: this.x.measure, point: [p[0] ?? NaN, p[1] ?? NaN, p[2] ?? NaN], length: Number(this.xLength.value) };
    const problem = p.length !== 3 ? `the point needs three numbers x, y, z (got "${this.xPoint.value}")` : xProblem(c);
    this.note(problem ? `x axis: ${problem}` : '');
    if (problem) return;
    this.x = c;
    this.draw();
  }

  private async readMeasured(): Promise<void> {
    const f = this.measuredInput.files?.[0];
    this.measuredInput.value = '';
    if (!f || !this.data) return;
    try {
      this.measured.set(this.data.key, parseMeasuredCsv(await f.text(), f.name));
      this.note('');
    } catch (e) {
      this.note(`Measured points not read: ${(e as Error).message}`);
    }
    this.draw();
  }

  private note(text: string): void {
    this.message.textContent = text;
    this.message.hidden = !text;
  }

  private toggleLarge(): void {
    const w = this.host.closest('.workspace');
    const on = !w?.classList.contains('chart-large');
    w?.classList.toggle('chart-large', on);
    this.enlarge.textContent = on ? 'Shrink' : 'Enlarge';
    document.body.dataset['chartLarge'] = String(on);
  }

  private resize(): void {
    if (this.plot) this.plot.setSize({ width: this.plotHost.clientWidth, height: Math.max(80, this.plotHost.clientHeight) });
  }

  private renderChips(): void {
    // one series needs no key: the y title above the plot names it (the row is left to the plot)
    this.chips.replaceChildren(...(this.shown.length > 1 ? this.shown : []).map((label, i) => {
      const c = el('span', 'chart-chip');
      c.style.borderColor = PALETTE[i % PALETTE.length]!;
      c.append(label);
      const x = el('button', undefined, '×');
      x.type = 'button';
      x.title = `take ${label} off the chart`;
      x.onclick = () => { this.shown = this.shown.filter((l) => l !== label); this.draw(); };
      c.append(x);
      return c;
    }));
    const m = this.measuredPoints;
    if (m) {
      const c = el('span', 'chart-chip measured', `● measured: ${m.name}${m.uncertainty ? ' (± bars)' : ''}, on the ${this.shown[0]} axis`);
      const x = el('button', undefined, '×');
      x.type = 'button';
      x.onclick = () => { this.measured.delete(this.data!.key); this.draw(); };
      c.append(x);
      this.chips.append(c);
    }
    if (this.data?.baseline) this.chips.append(el('span', 'chart-chip baseline', `- - baseline: ${this.data.baseline.file}`));
  }

  private draw(): void {
    this.plot?.destroy();
    this.plot = undefined;
    for (const t of this.yTitles) t.textContent = '';
    this.renderChips();
    const d = this.data;
    if (!d || this.shown.length === 0) return;
    const picked = this.shown.map((l) => d.series.find((s) => s.label === l)!).filter(Boolean);
    const units = [...new Set(picked.map((s) => s.unit))];
    if (units.length > 2) {
      this.note(`At most two units at once (left and right axis): ${units.join(', ')}. Take a series off the chart.`);
      this.shown = this.shown.slice(0, -1);
      return this.draw();
    }
    const xs = xValues(this.x, d);
    const base = d.baseline && d.baseline.s.length === d.s.length ? d.baseline : undefined;
    const m = this.measuredPoints;
    const maxAbs = (vals: Iterable<number>) => { let a = 0; for (const v of vals) if (Number.isFinite(v)) a = Math.max(a, Math.abs(v)); return a; };
    const xExp = sharedExponent(maxAbs([...xs, ...(m ? m.x : [])]));
    const xn = xName(this.x);
    const scaleKey = (unit: string) => `u${units.indexOf(unit)}`;
    const yExp = units.map((u) => sharedExponent(maxAbs(picked.filter((s) => s.unit === u).flatMap((s) => [...s.values, ...(base?.series.find((b) => b.label === s.label)?.values ?? [])])
      .concat(m && u === units[0] ? [...m.y].map((v, i) => Math.abs(v) + (m.uncertainty?.[i] ?? 0)) : []))));
    const yName = (u: string) => picked.filter((s) => s.unit === u).map((s) => s.label).join(', ');
    const data: (number | null)[][] = [Array.from(xs)];
    const series: uPlot.Series[] = [{}];
    picked.forEach((s, i) => {
      data.push(Array.from(s.values, (v) => (Number.isFinite(v) ? v : null)));
      series.push({ label: s.label, scale: scaleKey(s.unit), stroke: PALETTE[i % PALETTE.length], width: 2, spanGaps: false, points: { show: false } });
      const b = base?.series.find((x) => x.label === s.label);
      if (b) {
        data.push(Array.from(b.values, (v) => (Number.isFinite(v) ? v : null)));
        series.push({ label: `${s.label} (baseline)`, scale: scaleKey(s.unit), stroke: PALETTE[i % PALETTE.length], width: 1.5, dash: [6, 4], spanGaps: false, points: { show: false } });
      }
    });
    if (d.baseline && !base) this.note(`The baseline's line has ${d.baseline.s.length} samples, this one ${d.s.length}: the baseline is not drawn.`);
    else if (!this.message.textContent?.startsWith('Measured') && !this.message.textContent?.startsWith('x axis')) this.note('');
    const axisFor = (unit: string, side: 0 | 1): uPlot.Axis => ({
      // the title is the row above the plot (`yTitles`), not a label turned along the axis
      scale: scaleKey(unit), side: side === 0 ? 3 : 1, stroke: '#374151',
      grid: { show: side === 0, stroke: '#e5e7eb' }, size: 56, values: (_u, splits) => tickLabels(splits, yExp[units.indexOf(unit)]!),
    });
    const scales: uPlot.Scales = { x: { time: false } };
    for (const u of units) {
      scales[scaleKey(u)] = {
        // measured points (with their bars) stay inside the first unit's range
        range: (_u, lo, hi) => {
          let a = lo, b = hi;
          if (m && u === units[0]) m.y.forEach((v, i) => { const e = m.uncertainty?.[i] ?? 0; a = Math.min(a, v - e); b = Math.max(b, v + e); });
          // a flat series (a constant up to rounding, like p across a pipe) gets a ±5 % span, never a zoom into its rounding noise
          const mag = Math.max(Math.abs(a), Math.abs(b));
          if (!(b - a > FLAT_FRACTION * mag)) { const mid = (a + b) / 2, h = mag > 0 ? 0.05 * mag : 1; a = mid - h; b = mid + h; }
          const pad = 0.05 * (b - a);
          return [a - pad, b + pad];
        },
      };
    }
    // x may run back and forth (r/L across a diameter): its range from every value, measured points included
    let x0 = Infinity, x1 = -Infinity;
    for (const v of [...xs, ...(m ? m.x : [])]) if (Number.isFinite(v)) { x0 = Math.min(x0, v); x1 = Math.max(x1, v); }
    if (x0 < x1) scales['x'] = { time: false, range: () => [x0, x1] };
    this.plot = new uPlot({
      width: this.plotHost.clientWidth || 400,
      height: Math.max(80, this.plotHost.clientHeight || 160),
      legend: { show: false },
      cursor: { drag: { x: false, y: false } },
      scales,
      axes: [
        { label: axisTitle(xn.name, xn.unit, xExp), stroke: '#374151', grid: { stroke: '#e5e7eb' }, values: (_u, splits) => tickLabels(splits, xExp) },
        ...units.map((u, i) => axisFor(u, i as 0 | 1)),
      ],
      series,
      hooks: { draw: [(u) => { if (m) drawMeasured(u, m, scaleKey(units[0]!)); }] },
    }, data as uPlot.AlignedData, this.plotHost);
    // what the canvas shows, for tests and assistive reading
    this.plotHost.dataset['series'] = String(picked.length);
    this.plotHost.dataset['xTitle'] = axisTitle(xn.name, xn.unit, xExp);
    const titles = units.map((u, i) => axisTitle(yName(u), u, yExp[i]!));
    titles.forEach((t, i) => { this.yTitles[i]!.textContent = (titles.length > 1 ? ['left axis: ', 'right axis: '][i]! : '') + t; });
    this.plotHost.dataset['yTitles'] = titles.join(' | ');
    this.plotHost.setAttribute('aria-label', `chart of ${this.plotHost.dataset['yTitles']} against ${this.plotHost.dataset['xTitle']}`);
  }
}

/** Measured points as open circles with ± bars, on the canvas over the lines. */
function drawMeasured(u: uPlot, m: MeasuredPoints, scale: string): void {
  const ctx = u.ctx, r = 4 * devicePixelRatio;
  ctx.save();
  ctx.strokeStyle = MEASURED;
  ctx.fillStyle = '#ffffff';
  ctx.lineWidth = 1.5 * devicePixelRatio;
  for (let i = 0; i < m.x.length; i++) {
    const cx = u.valToPos(m.x[i]!, 'x', true), cy = u.valToPos(m.y[i]!, scale, true);
    const e = m.uncertainty?.[i];
    if (e) {
      const y0 = u.valToPos(m.y[i]! - e, scale, true), y1 = u.valToPos(m.y[i]! + e, scale, true);
      ctx.beginPath();
      ctx.moveTo(cx, y0); ctx.lineTo(cx, y1);
      ctx.moveTo(cx - r, y0); ctx.lineTo(cx + r, y0);
      ctx.moveTo(cx - r, y1); ctx.lineTo(cx + r, y1);
      ctx.stroke();
    }
    ctx.beginPath();
    ctx.arc(cx, cy, r, 0, 2 * Math.PI);
    ctx.fill();
    ctx.stroke();
  }
  ctx.restore();
}
