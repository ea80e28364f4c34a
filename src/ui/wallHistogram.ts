/**
 * A small y⁺ histogram as SVG text for the wall-quantities panel: one bar per bin (height = area share
 * of the bin), the y⁺ thresholds as dashed lines with the area share above each, the bins' ends and
 * the largest share on the axes. Pure: no DOM.
 */
import { formatNumber } from './format.ts';

export interface HistogramInput {
  /** Bin edges (bins + 1), ascending. */
  edges: readonly number[];
  /** Area share of each bin (0 … 1). */
  areaShare: readonly number[];
  /** Thresholds drawn, with the area share above each (0 … 1). */
  above: readonly { threshold: number; areaShare: number }[];
  title: string;
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
const r1 = (v: number) => String(Math.round(v * 10) / 10);

/** The histogram as an `<svg>` element's text, `width` × `height` px (default 260 × 130). */
export function histogramSvg(h: HistogramInput, width = 260, height = 130): string {
  const bins = h.areaShare.length;
  if (bins === 0 || h.edges.length !== bins + 1) throw new Error(`y+ histogram: ${h.edges.length} edges for ${bins} bins; expected bins + 1`);
  const left = 44, right = 8, top = 18, bottom = 22;
  const w = width - left - right, ht = height - top - bottom;
  const lo = h.edges[0]!, hi = h.edges[bins]!, span = hi > lo ? hi - lo : 1;
  const peak = Math.max(...h.areaShare, 1e-12);
  const x = (v: number) => left + ((v - lo) / span) * w;
  const parts: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" class="wall-histogram" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="sans-serif" font-size="10">`,
    `<text x="${left}" y="11" fill="#111827">${esc(h.title)}</text>`,
    `<line x1="${left}" y1="${top + ht}" x2="${left + w}" y2="${top + ht}" stroke="#4b5563"/>`,
    `<line x1="${left}" y1="${top}" x2="${left}" y2="${top + ht}" stroke="#4b5563"/>`,
  ];
  for (let i = 0; i < bins; i++) {
    const s = h.areaShare[i]!, bh = (s / peak) * ht;
    parts.push(`<rect data-bin="${i}" data-share="${s}" x="${r1(x(h.edges[i]!) + 0.5)}" y="${r1(top + ht - bh)}" width="${r1(Math.max(0.5, x(h.edges[i + 1]!) - x(h.edges[i]!) - 1))}" height="${r1(bh)}" fill="#1d4ed8"/>`);
  }
  let above = 0;
  for (const t of h.above) {
    if (!(t.threshold >= lo && t.threshold <= hi)) continue;
    const tx = r1(x(t.threshold)), rightHalf = x(t.threshold) > left + w / 2;
    // the label sits on the side with room: left of a line in the right half
    parts.push(`<line data-threshold="${t.threshold}" x1="${tx}" y1="${top}" x2="${tx}" y2="${top + ht}" stroke="#b91c1c" stroke-dasharray="3 2"/>`,
      `<text x="${tx}" y="${top + 9 + 11 * above++}" dx="${rightHalf ? -2 : 2}"${rightHalf ? ' text-anchor="end"' : ''} fill="#b91c1c">&gt; ${Number(t.threshold.toPrecision(4))}: ${(100 * t.areaShare).toFixed(1)} %</text>`);
  }
  parts.push(`<text x="${left}" y="${height - 8}" fill="#4b5563">${formatNumber(lo)}</text>`,
    `<text x="${left + w}" y="${height - 8}" text-anchor="end" fill="#4b5563">y+ ${formatNumber(hi)}</text>`,
    `<text x="${left - 3}" y="${top + 8}" text-anchor="end" fill="#4b5563">${(100 * peak).toFixed(1)} %</text>`,
    `<text x="${left - 3}" y="${top + ht}" text-anchor="end" fill="#4b5563">0</text>`, '</svg>');
  return parts.join('');
}
