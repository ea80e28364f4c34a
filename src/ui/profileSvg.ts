/**
 * A line probe's profile as a self-contained SVG picture for reports: the series against the arc length
 * (or any x measure), samples outside the mesh as gaps, round ticks labelled by `axisTicks.ts` (distinct,
 * a shared ×10ⁿ in the axis title), a legend, the probe's title and the caution. Pure: no DOM.
 */
import { axisTitle, niceTicks, sharedExponent, tickLabels } from './axisTicks.ts';

export interface ProfileSeries {
  label: string;
  unit: string;
  values: Float64Array;
}

export interface ProfileOptions {
  title: string;
  xName: string;
  xUnit: string;
  x: Float64Array;
  /** Series sharing one unit (one y axis). */
  series: ProfileSeries[];
  caution: string;
  /** Picture size in px. Default 760 × 430. */
  width?: number;
  height?: number;
}

/** Line colours, as the app's chart draws them. */
const PALETTE = ['#1d4ed8', '#b45309', '#047857', '#7c3aed', '#be123c', '#0e7490'];

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
const n2 = (v: number) => String(Math.round(v * 100) / 100);

function range(values: Iterable<number>): [number, number] {
  let a = Infinity, b = -Infinity;
  for (const v of values) if (Number.isFinite(v)) { a = Math.min(a, v); b = Math.max(b, v); }
  if (!(a <= b)) return [0, 1];
  const mag = Math.max(Math.abs(a), Math.abs(b));
  // flat (constant up to rounding): ±5 %, never a zoom into rounding noise
  if (!(b - a > 1e-9 * mag)) { const h = mag > 0 ? 0.05 * mag : 1; return [(a + b) / 2 - h, (a + b) / 2 + h]; }
  return [a, b];
}

/** Wraps text to lines of at most `n` characters, on spaces. */
function wrap(text: string, n: number): string[] {
  const out: string[] = [];
  let line = '';
  for (const w of text.split(' ')) {
    if (line && line.length + 1 + w.length > n) { out.push(line); line = w; } else line = line ? `${line} ${w}` : w;
  }
  if (line) out.push(line);
  return out;
}

/** The SVG text. */
export function profileSvg(o: ProfileOptions): string {
  const W = o.width ?? 760, H = o.height ?? 430;
  const cautionLines = wrap(`Caution: ${o.caution}`, Math.floor(W / 6.2));
  const left = 78, right = 20, top = 40, bottom = 62 + 14 * cautionLines.length;
  const pw = W - left - right, ph = H - top - bottom;
  const [x0, x1] = range(o.x);
  const [y0, y1] = range(o.series.flatMap((s) => Array.from(s.values)));
  const xt = niceTicks(x0, x1), yt = niceTicks(y0, y1);
  const xe = sharedExponent(Math.max(Math.abs(x0), Math.abs(x1))), ye = sharedExponent(Math.max(Math.abs(y0), Math.abs(y1)));
  const px = (v: number) => left + ((v - x0) / (x1 - x0)) * pw;
  const py = (v: number) => top + ph - ((v - y0) / (y1 - y0)) * ph;
  const unit = o.series[0]?.unit ?? '';
  const parts: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="system-ui, sans-serif" font-size="12">`,
    `<rect width="${W}" height="${H}" fill="#ffffff"/>`,
    `<text x="${left}" y="22" font-size="14" font-weight="600">${esc(o.title)}</text>`,
  ];
  const xl = tickLabels(xt, xe), yl = tickLabels(yt, ye);
  xt.forEach((t, i) => parts.push(`<line x1="${n2(px(t))}" y1="${top}" x2="${n2(px(t))}" y2="${top + ph}" stroke="#e5e7eb"/>`,
    `<text x="${n2(px(t))}" y="${top + ph + 16}" text-anchor="middle">${esc(xl[i]!)}</text>`));
  yt.forEach((t, i) => parts.push(`<line x1="${left}" y1="${n2(py(t))}" x2="${left + pw}" y2="${n2(py(t))}" stroke="#e5e7eb"/>`,
    `<text x="${left - 6}" y="${n2(py(t) + 4)}" text-anchor="end">${esc(yl[i]!)}</text>`));
  parts.push(`<rect x="${left}" y="${top}" width="${pw}" height="${ph}" fill="none" stroke="#6b7280"/>`,
    `<text x="${left + pw / 2}" y="${top + ph + 36}" text-anchor="middle">${esc(axisTitle(o.xName, o.xUnit, xe))}</text>`,
    `<text transform="translate(16 ${top + ph / 2}) rotate(-90)" text-anchor="middle">${esc(axisTitle(o.series.map((s) => s.label).join(', '), unit, ye))}</text>`);
  o.series.forEach((s, k) => {
    let d = '', pen = false;
    for (let i = 0; i < o.x.length; i++) {
      const v = s.values[i]!, x = o.x[i]!;
      if (!Number.isFinite(v) || !Number.isFinite(x)) { pen = false; continue; }
      d += `${pen ? 'L' : 'M'}${n2(px(x))} ${n2(py(v))}`;
      pen = true;
    }
    const c = PALETTE[k % PALETTE.length]!;
    parts.push(`<path d="${d}" fill="none" stroke="${c}" stroke-width="2" data-series="${esc(s.label)}"/>`,
      `<rect x="${left + pw - 150}" y="${top + 8 + 16 * k}" width="14" height="3" fill="${c}"/>`,
      `<text x="${left + pw - 130}" y="${top + 13 + 16 * k}">${esc(s.label)}</text>`);
  });
  cautionLines.forEach((l, i) => parts.push(`<text x="8" y="${H - 8 - 14 * (cautionLines.length - 1 - i)}" font-size="11" fill="#92400e" class="caution">${esc(l)}</text>`));
  parts.push('</svg>');
  return parts.join('\n');
}
