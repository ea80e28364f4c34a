/**
 * Plots of a history (value against time) and of its spectrum as self-contained SVG text: no script, no
 * external font, style or image, so the same string goes into a report folder (CLI) and into the app.
 * Axes carry 1–2–5 ticks with distinct labels at any scale (`axisTicks.ts`) and the unit in their titles;
 * a history plot can shade the statistics window, mark the end of the initial transient and draw the
 * window mean with its 95 % band. Long histories are drawn as a per-pixel min/max envelope, so every
 * extreme stays visible. Pure: no DOM.
 */
import { axisTicks, axisTitle, powerOfTen, type AxisTicks } from './axisTicks.ts';

/** Plot size and the font, with their defaults (px). */
export const PLOT_DEFAULTS = { width: 720, height: 300, fontSize: 12 };

const COLOURS = { line: '#23577f', axis: '#444', grid: '#e3e6ea', window: '#f0c75e', mean: '#a8322b', transient: '#7a7a7a', peak: '#a8322b', text: '#222' };
const MARGIN = { left: 74, right: 18, top: 30, bottom: 46 };

/** What `historySvg` draws. */
export interface HistoryPlotOptions {
  /** Times (time unit) and values (value unit), same length, time increasing. */
  time: Float64Array;
  values: Float64Array;
  /** Quantity name, e.g. `drag.Fx`: the heading, and the value axis unless `axisName` is given. */
  quantity: string;
  /** Short name for the value axis (e.g. the symbol `Q`); default: the quantity. */
  axisName?: string;
  /** Unit of the values, e.g. `N` ('' for none). */
  unit: string;
  /** Unit of time (default `s`). */
  timeUnit?: string;
  /** Heading above the plot (default: the quantity). */
  title?: string;
  /** Statistics window to shade (time unit). */
  window?: { from: number; to: number };
  /** Window mean to draw across the window (value unit), with its 95 % half-width as a band. */
  mean?: number;
  halfWidth95?: number;
  /** End of the initial transient (time unit): a dashed vertical line. */
  transientEnd?: number;
  width?: number;
  height?: number;
}

/** What `spectrumSvg` draws. */
export interface SpectrumPlotOptions {
  /** Frequencies (1/time unit) and squared-amplitude spectrum (value unit²), as from `dominantFrequency`. */
  frequencies: Float64Array;
  power: Float64Array;
  quantity: string;
  /** Unit of the history's values; the plot shows amplitude √power in it. */
  unit: string;
  /** Unit of frequency (default `Hz`). */
  frequencyUnit?: string;
  title?: string;
  /** Dominant tone to mark (frequency in 1/time unit, amplitude in value unit) and its Strouhal number. */
  peak?: { frequency: number; amplitude: number; strouhal?: number };
  width?: number;
  height?: number;
}

/** SVG text of a history plot. Throws when time and values differ in length or are empty. */
export function historySvg(o: HistoryPlotOptions): string {
  const n = o.time.length;
  if (n === 0 || o.values.length !== n) throw new Error(`history plot of ${o.quantity}: ${n} times and ${o.values.length} values; expected the same non-zero count`);
  const frame = makeFrame(o.width, o.height);
  let vmin = Infinity, vmax = -Infinity;
  for (let i = 0; i < n; i++) { vmin = Math.min(vmin, o.values[i]!); vmax = Math.max(vmax, o.values[i]!); }
  // the mean stays in view; a wide band is clipped to the frame rather than squashing the history
  if (o.mean !== undefined && Number.isFinite(o.mean)) { vmin = Math.min(vmin, o.mean); vmax = Math.max(vmax, o.mean); }
  const xt = axisTicks(o.time[0]!, o.time[n - 1]!, 7);
  const yt = axisTicks(vmin, vmax, 5);
  const sx = scale(xt, o.time[0]!, o.time[n - 1]!, frame.x0, frame.x1);
  const sy = scale(yt, vmin, vmax, frame.y1, frame.y0);
  // the time axis mapping, for a chart that turns a drag into a window
  const xMap = `data-x-pixels="${frame.x0} ${frame.x1}" data-x-range="${o.time[0]!} ${o.time[n - 1]!}"`;
  const parts: string[] = [open(frame, o.title ?? o.quantity, xMap)];
  parts.push(grid(frame, xt, yt, sx, sy));
  if (o.window) {
    const a = Math.max(sx(o.window.from), frame.x0), b = Math.min(sx(o.window.to), frame.x1);
    if (b > a) parts.push(`<rect class="window" x="${f(a)}" y="${frame.y0}" width="${f(b - a)}" height="${frame.y1 - frame.y0}" fill="${COLOURS.window}" fill-opacity="0.28"/>`);
  }
  if (o.transientEnd !== undefined && Number.isFinite(o.transientEnd)) {
    const x = sx(o.transientEnd);
    parts.push(`<line class="transient" x1="${f(x)}" y1="${frame.y0}" x2="${f(x)}" y2="${frame.y1}" stroke="${COLOURS.transient}" stroke-dasharray="3 3"/>`);
  }
  parts.push(`<path class="history" d="${historyPath(o.time, o.values, sx, sy, frame)}" fill="none" stroke="${COLOURS.line}" stroke-width="1.4" stroke-linejoin="round"/>`);
  if (o.mean !== undefined && Number.isFinite(o.mean)) {
    const a = o.window ? Math.max(sx(o.window.from), frame.x0) : frame.x0, b = o.window ? Math.min(sx(o.window.to), frame.x1) : frame.x1;
    const h = Number.isFinite(o.halfWidth95) ? o.halfWidth95! : 0;
    if (h > 0) {
      const top = Math.max(sy(o.mean + h), frame.y0), bottom = Math.min(sy(o.mean - h), frame.y1);
      parts.push(`<rect class="band" x="${f(a)}" y="${f(top)}" width="${f(b - a)}" height="${f(Math.max(bottom - top, 0.5))}" fill="${COLOURS.mean}" fill-opacity="0.16"/>`);
    }
    parts.push(`<line class="mean" x1="${f(a)}" y1="${f(sy(o.mean))}" x2="${f(b)}" y2="${f(sy(o.mean))}" stroke="${COLOURS.mean}" stroke-width="1.5" stroke-dasharray="6 3"/>`);
  }
  parts.push(axes(frame, xt, yt, sx, sy, axisTitle('time', o.timeUnit ?? 's', xt), axisTitle(o.axisName ?? o.quantity, o.unit, yt)));
  parts.push('</svg>');
  return parts.join('\n');
}

/** SVG text of a spectrum plot (amplitude √power against frequency). */
export function spectrumSvg(o: SpectrumPlotOptions): string {
  const n = o.frequencies.length;
  if (n === 0 || o.power.length !== n) throw new Error(`spectrum plot of ${o.quantity}: ${n} frequencies and ${o.power.length} powers; expected the same non-zero count`);
  const frame = makeFrame(o.width, o.height);
  const amp = Float64Array.from(o.power, (p) => Math.sqrt(Math.max(p, 0)));
  let amax = 0;
  for (let i = 0; i < n; i++) amax = Math.max(amax, amp[i]!);
  const xt = axisTicks(0, o.frequencies[n - 1]!, 7);
  const yt = axisTicks(0, amax > 0 ? amax * 1.08 : 1, 5);
  const sx = scale(xt, 0, o.frequencies[n - 1]!, frame.x0, frame.x1);
  const sy = scale(yt, 0, amax > 0 ? amax * 1.08 : 1, frame.y1, frame.y0);
  const parts: string[] = [open(frame, o.title ?? `spectrum of ${o.quantity}`), grid(frame, xt, yt, sx, sy)];
  parts.push(`<path class="spectrum" d="${historyPath(o.frequencies, amp, sx, sy, frame)}" fill="none" stroke="${COLOURS.line}" stroke-width="1.3"/>`);
  if (o.peak && Number.isFinite(o.peak.frequency)) {
    const x = sx(o.peak.frequency), y = sy(o.peak.amplitude);
    const text = `f = ${fmt(o.peak.frequency)} ${o.frequencyUnit ?? 'Hz'}, amplitude ${fmt(o.peak.amplitude)}${o.unit ? ` ${o.unit}` : ''}${o.peak.strouhal !== undefined ? `, St = ${fmt(o.peak.strouhal)}` : ''}`;
    const right = x > (frame.x0 + frame.x1) / 2;
    parts.push(`<circle class="peak" cx="${f(x)}" cy="${f(y)}" r="4" fill="none" stroke="${COLOURS.peak}" stroke-width="1.5"/>`);
    parts.push(`<text class="peak-label" x="${f(right ? x - 8 : x + 8)}" y="${f(Math.max(y - 8, frame.y0 + 12))}" text-anchor="${right ? 'end' : 'start'}" fill="${COLOURS.peak}">${esc(text)}</text>`);
  }
  parts.push(axes(frame, xt, yt, sx, sy, axisTitle('frequency', o.frequencyUnit ?? 'Hz', xt), axisTitle('amplitude', o.unit, yt)));
  parts.push('</svg>');
  return parts.join('\n');
}

interface Frame { width: number; height: number; x0: number; x1: number; y0: number; y1: number }

function makeFrame(width = PLOT_DEFAULTS.width, height = PLOT_DEFAULTS.height): Frame {
  const w = Math.max(160, Math.round(width)), h = Math.max(120, Math.round(height));
  return { width: w, height: h, x0: MARGIN.left, x1: w - MARGIN.right, y0: MARGIN.top, y1: h - MARGIN.bottom };
}

/** Time at pixel x (svg user units) of a history plot, from its root attributes `data-x-pixels` and `data-x-range`. */
export function plotTimeOfPixel(svgAttrs: { pixels: string; range: string }, x: number): number {
  const [p0, p1] = svgAttrs.pixels.split(' ').map(Number) as [number, number];
  const [t0, t1] = svgAttrs.range.split(' ').map(Number) as [number, number];
  return t0 + ((x - p0) / (p1 - p0)) * (t1 - t0);
}

/** Linear map from data to pixels over the union of the data range and the ticks. */
function scale(t: AxisTicks, lo: number, hi: number, p0: number, p1: number): (v: number) => number {
  const a = Math.min(lo, t.values[0] ?? lo), b = Math.max(hi, t.values[t.values.length - 1] ?? hi);
  const span = b - a || 1;
  return (v) => p0 + ((v - a) / span) * (p1 - p0);
}

function open(fr: Frame, title: string, extra = ''): string {
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${fr.width}" height="${fr.height}" viewBox="0 0 ${fr.width} ${fr.height}" font-family="sans-serif" font-size="${PLOT_DEFAULTS.fontSize}"${extra ? ' ' + extra : ''}>\n`
    + `<rect width="${fr.width}" height="${fr.height}" fill="#fff"/>\n`
    + `<text class="title" x="${fr.x0}" y="${fr.y0 - 10}" font-weight="bold" fill="${COLOURS.text}">${esc(title)}</text>`;
}

function grid(fr: Frame, xt: AxisTicks, yt: AxisTicks, sx: (v: number) => number, sy: (v: number) => number): string {
  const lines: string[] = [];
  for (const v of xt.values) lines.push(`M${f(sx(v))} ${fr.y0}V${fr.y1}`);
  for (const v of yt.values) lines.push(`M${fr.x0} ${f(sy(v))}H${fr.x1}`);
  return `<path class="grid" d="${lines.join('')}" stroke="${COLOURS.grid}" fill="none"/>`;
}

function axes(fr: Frame, xt: AxisTicks, yt: AxisTicks, sx: (v: number) => number, sy: (v: number) => number, xTitle: string, yTitle: string): string {
  const out: string[] = [`<path class="axes" d="M${fr.x0} ${fr.y0}V${fr.y1}H${fr.x1}" stroke="${COLOURS.axis}" fill="none"/>`];
  xt.values.forEach((v, i) => {
    const x = f(sx(v));
    out.push(`<path d="M${x} ${fr.y1}v5" stroke="${COLOURS.axis}"/><text class="x-tick" x="${x}" y="${fr.y1 + 17}" text-anchor="middle" fill="${COLOURS.text}">${esc(xt.labels[i]!)}</text>`);
  });
  yt.values.forEach((v, i) => {
    const y = f(sy(v));
    out.push(`<path d="M${fr.x0} ${y}h-5" stroke="${COLOURS.axis}"/><text class="y-tick" x="${fr.x0 - 8}" y="${y}" dy="0.35em" text-anchor="end" fill="${COLOURS.text}">${esc(yt.labels[i]!)}</text>`);
  });
  const midX = (fr.x0 + fr.x1) / 2, midY = (fr.y0 + fr.y1) / 2;
  out.push(`<text class="x-title" x="${f(midX)}" y="${fr.height - 8}" text-anchor="middle" fill="${COLOURS.text}">${esc(xTitle)}</text>`);
  out.push(`<text class="y-title" transform="translate(16 ${f(midY)}) rotate(-90)" text-anchor="middle" fill="${COLOURS.text}">${esc(yTitle)}</text>`);
  return out.join('\n');
}

/**
 * Path through the points; with more than two points per pixel column, each column is drawn as the
 * vertical span of its values (min to max) joined in order, so spikes survive.
 */
function historyPath(x: Float64Array, y: Float64Array, sx: (v: number) => number, sy: (v: number) => number, fr: Frame): string {
  const n = x.length;
  const cols = Math.max(1, Math.round(fr.x1 - fr.x0));
  const d: string[] = [];
  if (n <= 2 * cols) {
    for (let i = 0; i < n; i++) d.push(`${i ? 'L' : 'M'}${f(sx(x[i]!))} ${f(sy(y[i]!))}`);
    return d.join('');
  }
  let col = -1, lo = 0, hi = 0, first = 0, last = 0;
  const flush = () => {
    const px = f(fr.x0 + col + 0.5);
    d.push(`${d.length ? 'L' : 'M'}${px} ${f(sy(first))}L${px} ${f(sy(lo))}L${px} ${f(sy(hi))}L${px} ${f(sy(last))}`);
  };
  for (let i = 0; i < n; i++) {
    const c = Math.min(cols - 1, Math.max(0, Math.floor(sx(x[i]!) - fr.x0)));
    const v = y[i]!;
    if (c !== col) {
      if (col >= 0) flush();
      col = c; lo = hi = first = last = v;
    } else { lo = Math.min(lo, v); hi = Math.max(hi, v); last = v; }
  }
  flush();
  return d.join('');
}

/** Pixel coordinate with 0.1 px precision. */
function f(v: number): string {
  return String(Math.round(v * 10) / 10);
}

/** A value for a label: 4 significant figures, ×10ⁿ beyond plain magnitudes. */
function fmt(v: number): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e-3 && a < 1e5) return String(Number(v.toPrecision(4))).replace('-', '−');
  const [m, e] = v.toExponential(3).split('e') as [string, string];
  return `${m.replace('-', '−')}×${powerOfTen(Number(e))}`;
}

/** Escapes text for SVG content and attributes. */
function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}
