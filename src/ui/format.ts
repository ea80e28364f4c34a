/**
 * Number formatting for everything the viewer shows or exports: a fixed count of significant figures,
 * plain notation for ordinary magnitudes and exponent notation (×10ⁿ on screen, e-notation in files)
 * for very small or very large ones. Pure: no DOM.
 */

/** Significant figures used by pins, the results table and exports (4: what a CFD result usually supports). */
export const SIGNIFICANT_FIGURES = 4;

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/**
 * `v` rounded to `sig` significant figures as text. Plain notation for 1e-3 ≤ |v| < 1e5, otherwise
 * mantissa and exponent: `1.234×10⁻⁵` (screen) or `1.234e-5` (`plain: true`, for CSV/JSON/clipboard).
 * Non-finite values give '—' (never a number that was not computed).
 */
export function formatNumber(v: number, sig = SIGNIFICANT_FIGURES, plain = false): string {
  if (!Number.isFinite(v)) return '—';
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e-3 && a < 1e5) {
    // toPrecision keeps trailing zeros, which state the precision (e.g. 0.2500)
    const s = v.toPrecision(sig);
    return s.includes('e') ? String(Number(s)) : s;
  }
  const [m, e] = v.toExponential(sig - 1).split('e') as [string, string];
  const exp = String(Number(e));
  return plain ? `${m}e${exp}` : `${m}×10${[...exp].map((c) => SUPERSCRIPT[c] ?? c).join('')}`;
}

/** A value with its unit: `1.234×10⁻³ kg/s`; the unit is left out when empty. */
export function withUnit(v: number, unit: string, sig = SIGNIFICANT_FIGURES, plain = false): string {
  const n = formatNumber(v, sig, plain);
  return unit && n !== '—' ? `${n} ${unit}` : n;
}

/** A vector as `(x, y, z)` with each component formatted. */
export function formatVec(v: ArrayLike<number>, sig = SIGNIFICANT_FIGURES, plain = false): string {
  return `(${Array.from(v, (x) => formatNumber(x, sig, plain)).join(', ')})`;
}

/**
 * `v` rounded to `figures` significant figures of `scale` (a length of the geometry, in v's unit), not of v
 * itself: every coordinate in a box of that size gets the same absolute step, so a computed centre such as
 * −0.0024999999999999996 reads −0.0025 and rounding noise beside 0 becomes 0. The result is what a panel shows
 * and what is computed with. `v` unchanged when it or `scale` is not a finite number (scale must be > 0).
 */
export function roundToScale(v: number, scale: number, figures = 6): number {
  if (!Number.isFinite(v) || !(scale > 0 && Number.isFinite(scale))) return v;
  const decimals = figures - 1 - Math.floor(Math.log10(scale));
  if (decimals >= 0) return Number(v.toFixed(Math.min(decimals, 100)));
  const step = 10 ** -decimals;
  return Math.round(v / step) * step;
}

/** Parses a number as formatted by `formatNumber` (either notation); NaN for '—' or junk. */
export function parseFormatted(text: string): number {
  const t = text.trim().replace(/\u2212/g, '-');
  const m = /^(-?[\d.]+)\s*(?:×10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)|e([-+]?\d+))?/.exec(t);
  if (!m) return NaN;
  const back: Record<string, string> = Object.fromEntries(Object.entries(SUPERSCRIPT).map(([k, s]) => [s, k]));
  const exp = m[2] ? Number([...m[2]].map((c) => back[c] ?? '').join('')) : m[3] ? Number(m[3]) : 0;
  return Number(`${m[1]}e${exp}`);
}

/** A byte count for progress and warnings: `12.3 MB`. */
export function formatBytes(n: number): string {
  if (n < 1000) return `${n} B`;
  const units = ['kB', 'MB', 'GB', 'TB'];
  let v = n / 1000, i = 0;
  while (v >= 1000 && i < units.length - 1) { v /= 1000; i++; }
  return `${v.toPrecision(3)} ${units[i]}`;
}
