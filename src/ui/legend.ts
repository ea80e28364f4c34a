/**
 * The colour legend: field name with unit, a colour bar, and tick values over the range (marked
 * "fixed" when the user set it). One description, drawn both as DOM over the view and onto exports.
 */
import { colorMapCss, type ColorMap } from '../view/colorMaps.ts';
import { formatNumber } from './format.ts';

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

function tickValues(lo: number, hi: number): number[] {
  return Array.from({ length: TICKS }, (_, i) => lo + (hi - lo) * (i / (TICKS - 1)));
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
    const ticks = tickValues(s.range[0], s.range[1]).reverse();
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
    for (const t of ticks) {
      const d = document.createElement('div');
      d.textContent = formatNumber(t);
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
  const ticks = tickValues(s.range[0], s.range[1]).reverse();
  ctx.save();
  ctx.font = font(12);
  const tickW = Math.max(...ticks.map((t) => ctx.measureText(formatNumber(t)).width));
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
  ticks.forEach((t, i) => ctx.fillText(formatNumber(t), x0 + pad + barW + 8 * scale, by + barH * (i / (TICKS - 1))));
  if (s.fixed) {
    ctx.textBaseline = 'top';
    ctx.fillStyle = '#4b5563';
    ctx.fillText('fixed range', x0 + pad, by + barH + 6 * scale);
  }
  ctx.restore();
  return { x: x0, y: y0, width: boxW, height: boxH };
}
