/**
 * The colour legend: field name with unit, a colour bar, and tick values over the range (marked
 * "fixed" when the user set it). One description, drawn both as DOM over the view and onto exports.
 */
import { colorMapCss, type ColorMap } from '../view/colorMaps.ts';
import { SIGNIFICANT_FIGURES, formatNumber } from './format.ts';

export interface LegendState {
  /** e.g. `velocity (magnitude)`. */
  title: string;
  unit: string;
  range: [number, number];
  fixed: boolean;
  map: ColorMap;
}

/** Number of tick labels on the bar. */
const TICKS = 5;

/** One tick label of the bar: its text and where it sits, 0 at the top (high end) to 1 at the bottom. */
export interface LegendTick {
  readonly text: string;
  readonly at: number;
}

/**
 * Tick labels over `[lo, hi]`, high end first, always distinct: `TICKS` evenly spaced values with as many
 * significant figures as they need to differ (4 at least, 15 at most); a range too narrow for that keeps
 * its two ends; a constant field (lo = hi) gets one label in the middle of the bar.
 */
export function legendTicks(lo: number, hi: number): LegendTick[] {
  if (!(hi > lo) || formatNumber(lo, 15) === formatNumber(hi, 15)) return [{ text: formatNumber(lo), at: 0.5 }];
  const values = Array.from({ length: TICKS }, (_, i) => hi - (hi - lo) * (i / (TICKS - 1)));
  for (const [vs, ats] of [[values, values.map((_, i) => i / (TICKS - 1))], [[hi, lo], [0, 1]]] as const) {
    for (let sig = SIGNIFICANT_FIGURES; sig <= 15; sig++) {
      const texts = vs.map((v) => formatNumber(v, sig));
      if (new Set(texts).size === texts.length) return texts.map((text, i) => ({ text, at: ats[i]! }));
    }
  }
  return [{ text: formatNumber(hi, 15), at: 0 }, { text: formatNumber(lo, 15), at: 1 }];
}

/** Heading line: `title [unit]` plus `(fixed range)` when fixed. */
export function legendHeading(s: LegendState): string {
  return `${s.title}${s.unit ? ` [${s.unit}]` : ''}`;
}

/** The legend as DOM (vertical bar, high end on top). */
export class LegendView {
  private readonly el: HTMLDivElement;

  constructor(host: HTMLElement) {
    this.el = document.createElement('div');
    this.el.className = 'legend';
    this.el.hidden = true;
    host.append(this.el);
  }

  set(s: LegendState | null): void {
    this.el.hidden = !s;
    if (!s) return;
    const stops = Array.from({ length: 17 }, (_, i) => `${colorMapCss(s.map, 1 - i / 16)} ${(i / 16 * 100).toFixed(1)}%`);
    const ticks = legendTicks(s.range[0], s.range[1]);
    this.el.innerHTML = '';
    const head = document.createElement('div');
    head.className = 'legend-title';
    head.textContent = legendHeading(s);
    const body = document.createElement('div');
    body.className = 'legend-body';
    const bar = document.createElement('div');
    bar.className = 'legend-bar';
    bar.style.background = `linear-gradient(to bottom, ${stops.join(', ')})`;
    const labels = document.createElement('div');
    labels.className = 'legend-ticks';
    // one label sits in the middle of the bar, several spread from top to bottom
    labels.style.justifyContent = ticks.length === 1 ? 'center' : '';
    for (const t of ticks) {
      const d = document.createElement('div');
      d.textContent = t.text;
      labels.append(d);
    }
    body.append(bar, labels);
    this.el.append(head, body);
    if (s.fixed) {
      const f = document.createElement('div');
      f.className = 'legend-note';
      f.textContent = 'fixed range';
      this.el.append(f);
    }
  }
}

/** Draws the legend at the bottom-left of an exported picture; `scale` is device pixels per CSS pixel. */
/** Draws the legend box at the picture's lower left; returns the box (pixels) so pins keep clear of it. */
export function drawLegend(ctx: CanvasRenderingContext2D, s: LegendState, scale: number): { x: number; y: number; width: number; height: number } {
  const font = (px: number, weight = '') => `${weight}${px * scale}px system-ui, -apple-system, "Segoe UI", Roboto, Arial, sans-serif`;
  const barW = 16 * scale, barH = 180 * scale, pad = 10 * scale;
  const ticks = legendTicks(s.range[0], s.range[1]);
  ctx.save();
  ctx.font = font(12);
  const tickW = Math.max(...ticks.map((t) => ctx.measureText(t.text).width));
  ctx.font = font(12, '600 ');
  const headW = ctx.measureText(legendHeading(s)).width;
  const boxW = Math.max(headW, barW + 8 * scale + tickW) + 2 * pad;
  const boxH = barH + 2 * pad + 24 * scale + (s.fixed ? 16 * scale : 0);
  const x0 = 16 * scale, y0 = ctx.canvas.height - boxH - 16 * scale;
  ctx.fillStyle = 'rgba(255,255,255,0.92)';
  ctx.fillRect(x0, y0, boxW, boxH);
  ctx.strokeStyle = '#9ca3af';
  ctx.lineWidth = scale;
  ctx.strokeRect(x0, y0, boxW, boxH);
  ctx.fillStyle = '#111827';
  ctx.textBaseline = 'top';
  ctx.fillText(legendHeading(s), x0 + pad, y0 + pad);
  const by = y0 + pad + 24 * scale;
  for (let i = 0; i < barH; i++) {
    ctx.fillStyle = colorMapCss(s.map, 1 - i / (barH - 1));
    ctx.fillRect(x0 + pad, by + i, barW, 1);
  }
  ctx.strokeRect(x0 + pad, by, barW, barH);
  ctx.font = font(12);
  ctx.textBaseline = 'middle';
  ctx.fillStyle = '#111827';
  for (const t of ticks) ctx.fillText(t.text, x0 + pad + barW + 8 * scale, by + barH * t.at);
  if (s.fixed) {
    ctx.textBaseline = 'top';
    ctx.fillStyle = '#4b5563';
    ctx.fillText('fixed range', x0 + pad, by + barH + 6 * scale);
  }
  ctx.restore();
  return { x: x0, y: y0, width: boxW, height: boxH };
}
