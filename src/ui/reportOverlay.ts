/**
 * Pins and the colour legend as SVG markup, for laying over a report picture rendered without a browser
 * (the command line's software picture): the text stays crisp at any zoom and can be selected. The pins
 * are laid out by the same rule as on screen (`pinLayout.ts`); box sizes are estimated from the text
 * length since there is no font to measure. Pure: returns strings.
 */
import { triadBox, triadSvg, type ViewBasis } from '../study/axisTriad.ts';
import { colorMapCss, type ColorMap } from '../view/colorMaps.ts';
import { formatNumber, withUnit } from './format.ts';
import { layoutPins, leaderEnd } from './pinLayout.ts';
import { PIN_STYLE } from './pins.ts';

/** A pin to draw: its anchor on the picture (pixels), a title and text rows. */
export interface OverlayPin {
  id: string;
  x: number;
  y: number;
  title: string;
  rows: string[];
}

/** The legend: heading (field and unit), the colour map and the range. */
export interface OverlayLegend {
  title: string;
  unit: string;
  range: [number, number];
  map: ColorMap;
}

const esc = (s: string): string => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** Estimated width in pixels of text at 12 px in a sans-serif face (bold a little wider). */
function textWidth(s: string, bold = false): number {
  let w = 0;
  for (const ch of s) w += /[ilj.,:;|'!()[\]]/.test(ch) ? 3.6 : /[mwMW@]/.test(ch) ? 10 : /[A-Z0-9₀-₉]/.test(ch) ? 7.6 : 6.6;
  return w * (bold ? 1.07 : 1);
}

/** Text of a pin row: `label = value unit`, 4 significant figures like the viewer's pins. */
export function pinRow(label: string, value: number, unit: string): string {
  return `${label} = ${withUnit(value, unit === '1' ? '' : unit)}`;
}

/**
 * SVG markup (width × height pixel coordinates) with the pins, their leader lines, the legend and, given the
 * picture's camera basis, the axis triad (bottom right; pins keep clear of it).
 */
export function overlaySvg(width: number, height: number, pins: readonly OverlayPin[], legend: OverlayLegend | null, triad?: ViewBasis): string {
  const pad = PIN_STYLE.padding, lh = PIN_STYLE.lineHeight;
  const boxes = pins.map((p) => ({
    id: p.id, anchorX: p.x, anchorY: p.y,
    width: Math.ceil(Math.max(textWidth(p.title, true), ...p.rows.map((r) => textWidth(r))) + 2 * pad),
    height: (p.rows.length + 1) * lh + 2 * pad,
  }));
  const triadAt = triad ? triadBox(width, height) : undefined;
  const placed = layoutPins(boxes, width, height, triadAt ? { obstacles: [triadAt] } : {});
  const parts: string[] = [`<svg class="overlay" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" font-family="system-ui, -apple-system, 'Segoe UI', Roboto, Arial, sans-serif" font-size="12">`];
  for (const p of placed) {
    const pin = pins.find((x) => x.id === p.id)!;
    const [ex, ey] = leaderEnd(p);
    parts.push(`<g class="pin" data-pin="${esc(p.id)}">`,
      `<line x1="${p.anchorX.toFixed(1)}" y1="${p.anchorY.toFixed(1)}" x2="${ex.toFixed(1)}" y2="${ey.toFixed(1)}" stroke="${PIN_STYLE.leader}" stroke-width="1.5"/>`,
      `<circle cx="${p.anchorX.toFixed(1)}" cy="${p.anchorY.toFixed(1)}" r="3.5" fill="${PIN_STYLE.leader}" stroke="white" stroke-width="1"/>`,
      `<rect x="${p.x.toFixed(1)}" y="${p.y.toFixed(1)}" width="${p.width}" height="${p.height}" fill="${PIN_STYLE.background}" stroke="${PIN_STYLE.border}" stroke-width="1.5"/>`,
      `<text x="${(p.x + pad).toFixed(1)}" y="${(p.y + pad + 12).toFixed(1)}" fill="${PIN_STYLE.title}" font-weight="600">${esc(pin.title)}</text>`);
    pin.rows.forEach((r, i) => parts.push(`<text x="${(p.x + pad).toFixed(1)}" y="${(p.y + pad + 12 + (i + 1) * lh).toFixed(1)}" fill="${PIN_STYLE.text}">${esc(r)}</text>`));
    parts.push('</g>');
  }
  if (legend) parts.push(legendSvg(height, legend));
  if (triad && triadAt) parts.push(triadSvg(triad, triadAt.x, triadAt.y));
  parts.push('</svg>');
  return parts.join('');
}

function legendSvg(height: number, s: OverlayLegend): string {
  const barW = 16, barH = Math.min(180, Math.max(60, height * 0.3)), pad = 10;
  const ticks = Array.from({ length: 5 }, (_, i) => s.range[1] - (s.range[1] - s.range[0]) * (i / 4));
  const heading = `${s.title}${s.unit ? ` [${s.unit}]` : ''}`;
  const w = Math.ceil(Math.max(textWidth(heading, true), barW + 8 + Math.max(...ticks.map((t) => textWidth(formatNumber(t)))))) + 2 * pad;
  const h = barH + 2 * pad + 24;
  const x0 = 16, y0 = height - h - 16, by = y0 + pad + 24;
  const stops = Array.from({ length: 17 }, (_, i) => `<stop offset="${(i / 16).toFixed(4)}" stop-color="${colorMapCss(s.map, 1 - i / 16)}"/>`).join('');
  return [
    `<g class="legend"><defs><linearGradient id="legend-bar" x1="0" y1="0" x2="0" y2="1">${stops}</linearGradient></defs>`,
    `<rect x="${x0}" y="${y0}" width="${w}" height="${h}" fill="rgba(255,255,255,0.92)" stroke="#9ca3af"/>`,
    `<text x="${x0 + pad}" y="${y0 + pad + 12}" fill="#111827" font-weight="600">${esc(heading)}</text>`,
    `<rect x="${x0 + pad}" y="${by}" width="${barW}" height="${barH}" fill="url(#legend-bar)" stroke="#6b7280"/>`,
    ...ticks.map((t, i) => `<text x="${x0 + pad + barW + 8}" y="${(by + barH * (i / 4) + 4).toFixed(1)}" fill="#111827">${esc(formatNumber(t))}</text>`),
    '</g>',
  ].join('');
}
