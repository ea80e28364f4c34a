/**
 * Tick labels that are always distinct and readable at any scale: one shared power of ten in steps of
 * three (shown once, in the axis title, as `×10⁻³`) brings the values to 0.1 … 1000, and each label gets
 * just the decimals its tick step needs, so a millimetre line reads "0, 0.5, 1.0, 1.5 ×10⁻³ m" instead of
 * "0, 0, 0.001, 0.001". Pure: no DOM.
 */

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** The shared power of ten (a multiple of 3) for values up to `maxAbs` in magnitude; 0 when they read well as they are (0.01 … 10 000). */
export function sharedExponent(maxAbs: number): number {
  if (!(maxAbs > 0) || !Number.isFinite(maxAbs) || (maxAbs >= 1e-2 && maxAbs < 1e4)) return 0;
  return 3 * Math.floor(Math.log10(maxAbs) / 3);
}

/** `×10⁻³`, or '' for exponent 0. */
export function exponentText(e: number): string {
  return e === 0 ? '' : `×10${[...String(e)].map((c) => SUPERSCRIPT[c] ?? c).join('')}`;
}

/** An axis title with its shared factor and unit: `s [×10⁻³ m]`, `p [Pa]`, `u/U` (no unit, no factor). */
export function axisTitle(name: string, unit: string, exponent: number): string {
  const inside = [exponentText(exponent), unit].filter(Boolean).join(' ');
  return inside ? `${name} [${inside}]` : name;
}

/**
 * Labels for ticks `values` (in the data's units) scaled by 10^-`exponent`: the fewest decimals that write
 * every tick exactly (at most 6; more only when two would otherwise read the same), the same for every label.
 */
export function tickLabels(values: readonly number[], exponent: number): string[] {
  const k = 10 ** -exponent;
  const scaled = values.map((v) => v * k);
  let step = Infinity;
  for (let i = 1; i < scaled.length; i++) {
    const d = Math.abs(scaled[i]! - scaled[i - 1]!);
    if (d > 0 && d < step) step = d;
  }
  // the fewest decimals that write every tick exactly (0.0025 needs four, 2.5 one), at most 6
  const exact = (d: number) => scaled.every((v) => { const m = v * 10 ** d; return Math.abs(m - Math.round(m)) <= 1e-6 * Math.max(1, Math.abs(m)); });
  let decimals = 0;
  while (decimals < 6 && !exact(decimals)) decimals++;
  const text = (d: number) => scaled.map((v) => (Math.abs(v) < 1e-12 * (Number.isFinite(step) ? step : 1) ? 0 : v).toFixed(d).replace(/^-(0\.?0*)$/, '$1'));
  let out = text(decimals);
  // ticks closer than 10⁻⁶ of their size still come out distinct
  while (decimals < 12 && new Set(out).size < new Set(scaled).size) out = text(++decimals);
  return out;
}

/** About `count` round tick values (steps of 1, 2, 2.5 or 5 × 10ⁿ) covering [lo, hi]. */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo) || !Number.isFinite(lo) || !Number.isFinite(hi)) return Number.isFinite(lo) ? [lo] : [];
  const raw = (hi - lo) / Math.max(1, count), p = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * p).find((s) => s >= raw * 0.999)!;
  const out: number[] = [];
  for (let k = Math.ceil(lo / step - 1e-9); k * step <= hi + 1e-9 * step; k++) out.push(Number((k * step).toPrecision(12)));
  return out;
}
