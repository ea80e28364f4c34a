/**
 * Axis ticks for the plots of histories and spectra: 1–2–5 steps, labels that are short, distinct and
 * readable at any scale. Values far from 1 share one power of ten that goes into the axis title
 * (engineering exponents: ×10⁻³, ×10⁶ …); a narrow range far from zero (101 325.001–101 325.004 Pa) is
 * labelled relative to a round offset that also goes into the title. Pure: no DOM.
 */

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** Labels beyond this many digits before the step's last digit switch to an offset. */
const MAX_LABEL_DIGITS = 5;

/** Ticks of one axis. */
export interface AxisTicks {
  /** Tick positions in data units, increasing, inside [min, max]. */
  values: number[];
  /** Their labels (already divided by the shared power and offset), all distinct. */
  labels: string[];
  /** Shared power of ten of the labels (label × 10^exponent + offset = value); 0 when none. */
  exponent: number;
  /** Offset subtracted before scaling (data units); 0 when none. */
  offset: number;
}

/** `10⁻³`-style text of a power of ten. */
export function powerOfTen(exponent: number): string {
  return `10${[...String(exponent)].map((c) => SUPERSCRIPT[c] ?? c).join('')}`;
}

/**
 * Ticks for data spanning [min, max], about `target` of them (at least 2 shown for any finite range).
 * A zero or non-finite span is widened around the value so the axis still reads.
 */
export function axisTicks(min: number, max: number, target = 6): AxisTicks {
  if (!Number.isFinite(min) || !Number.isFinite(max)) { min = 0; max = 1; }
  if (max < min) [min, max] = [max, min];
  if (max - min <= 1e-12 * Math.max(Math.abs(min), Math.abs(max))) {
    const pad = min === 0 ? 1 : Math.abs(min) * 1e-3;
    min -= pad; max += pad;
  }
  const raw = (max - min) / Math.max(target, 1);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const mult = [1, 2, 5, 10].find((m) => m * mag >= raw * (1 - 1e-12)) ?? 10;
  const step = mult * mag;
  const k0 = Math.ceil(min / step - 1e-9), k1 = Math.floor(max / step + 1e-9);
  const values: number[] = [];
  for (let k = k0; k <= k1; k++) values.push(k * step);

  const stepExp = Math.floor(Math.log10(step) + 1e-9);
  const maxAbs = Math.max(Math.abs(values[0] ?? min), Math.abs(values[values.length - 1] ?? max));
  let offset = 0;
  // digits a label would need between its leading digit and the step's digit
  if (maxAbs > 0 && Math.floor(Math.log10(maxAbs)) - stepExp >= MAX_LABEL_DIGITS) {
    const unit = 10 ** (stepExp + 3);
    offset = Math.round((0.5 * (min + max)) / unit) * unit;
  }
  const shifted = values.map((v) => v - offset);
  const shiftedMax = Math.max(...shifted.map(Math.abs), step);
  const lead = Math.floor(Math.log10(shiftedMax) + 1e-9);
  const exponent = lead >= -2 && lead < 4 ? 0 : 3 * Math.floor(lead / 3);
  const scaledStepExp = stepExp - exponent;
  const decimals = Math.max(0, -scaledStepExp);
  const labels = shifted.map((v) => {
    const s = (v / 10 ** exponent).toFixed(decimals);
    return /^-0(\.0+)?$/.test(s) ? s.slice(1) : s.replace('-', '−');
  });
  return { values, labels, exponent, offset };
}

/**
 * Axis title with the unit and what the labels share: `drag [N]`, `drag [×10⁶ N]`,
 * `p − 101 325 [Pa]`, `p − 101 325 [×10⁻³ Pa]`.
 */
export function axisTitle(name: string, unit: string, ticks: AxisTicks): string {
  const off = ticks.offset !== 0 ? ` ${ticks.offset < 0 ? '+' : '−'} ${groupDigits(Math.abs(ticks.offset))}` : '';
  const scale = ticks.exponent !== 0 ? `×${powerOfTen(ticks.exponent)}` : '';
  const inside = [scale, unit].filter(Boolean).join(' ');
  return `${name}${off}${inside ? ` [${inside}]` : ''}`;
}

/** A number with thin-space thousands groups (101 325, 0.001 5) as it would be typeset. */
function groupDigits(v: number): string {
  const s = Math.abs(v) >= 1e15 || (Math.abs(v) < 1e-6 && v !== 0) ? v.toExponential() : String(Number(v.toPrecision(15)));
  if (s.includes('e')) {
    const [m, e] = s.split('e') as [string, string];
    return `${m}×${powerOfTen(Number(e))}`;
  }
  const [int, frac] = s.split('.') as [string, string | undefined];
  const g = int.replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009');
  return frac ? `${g}.${frac}` : g;
}
