/**
 * Dominant frequency, amplitude and phase of a history over a time window, to well under one frequency
 * bin, on uneven steps:
 * 1. Lomb–Scargle periodogram (Lomb 1976; Scargle 1982; `lombScargle.ts`) of the samples in the window,
 *    on a grid oversampled `SPECTRUM_OVERSAMPLING` times finer than the resolution 1/T, up to the mean
 *    Nyquist frequency N/(2T) (T the window's span, N its samples); a record so long that this would
 *    exceed `SPECTRUM_MAX_WORK` gets two points per bin and a lower top frequency, said in the note;
 * 2. its highest peak at or above 1/T (at least one whole cycle in the window);
 * 3. refined by a least-squares sine fit x ≈ c + a·cos ωt + b·sin ωt, the frequency moved by golden-section
 *    search within one grid step either side of the peak to minimise the residual — the nonlinear
 *    least-squares estimate of a single tone (for white noise the maximum-likelihood one, Rife & Boorstyn
 *    1974, IEEE Trans. Inf. Theory 20(5), from memory).
 * Also the Strouhal number f·L/U. Pure: no DOM.
 */
import { lombScargle } from './lombScargle.ts';
import { checkHistory, selectWindow } from './seriesInput.ts';

/** Grid points per resolution bin 1/T. */
export const SPECTRUM_OVERSAMPLING = 4;
/** Most samples × frequencies of one periodogram (keeps a long record to about a second of work). */
export const SPECTRUM_MAX_WORK = 1.5e8;
/** Fewest samples in the window for a spectrum. */
export const SPECTRUM_MIN_SAMPLES = 8;

export const SPECTRUM_METHOD = 'Lomb–Scargle periodogram (Lomb 1976; Scargle 1982), peak refined by a least-squares sine fit';

/** Dominant tone of a history and its spectrum. */
export interface DominantFrequency {
  /** Frequency of the dominant tone (1/time unit, Hz for seconds). */
  frequency: number;
  /** Its amplitude (value unit): half the peak-to-peak swing of the fitted sine. */
  amplitude: number;
  /** Phase (rad) in x ≈ offset + amplitude·cos(2π·frequency·(t − from) + phase). */
  phase: number;
  /** Offset of the fitted sine (value unit). */
  offset: number;
  /** Method with its sources. */
  method: string;
  /** Frequency resolution 1/T of the window (1/time unit); the fit is far finer than this. */
  resolution: number;
  /** Cycles of the dominant tone in the window: frequency·T. */
  cycles: number;
  /** Window used (time unit). */
  from: number;
  to: number;
  /** Frequency grid of the spectrum (1/time unit), evenly spaced from its spacing up. */
  frequencies: Float64Array;
  /**
   * Squared-amplitude spectrum (value unit²): 4·P/N with P the Lomb–Scargle power, so a sinusoid of
   * amplitude A makes a peak of about A².
   */
  power: Float64Array;
  /** Present when the spectrum was limited (long record) or the tone is poorly resolved. */
  note?: string;
}

/**
 * Dominant frequency of `values` over [from, to] (defaults: the whole record); time Float64Array strictly
 * increasing, possibly uneven. Null when the window holds fewer than 8 samples or the values do not vary.
 * Throws a one-line error on invalid input; `label` names the quantity in errors.
 */
export function dominantFrequency(time: Float64Array, values: Float64Array, from?: number, to?: number, label = 'history'): DominantFrequency | null {
  const who = `spectrum of ${label}`;
  checkHistory(who, time, values, 2);
  const w = selectWindow(who, time, from, to, 2);
  const n = w.last - w.first + 1;
  if (n < SPECTRUM_MIN_SAMPLES) return null;
  let lo = Infinity, hi = -Infinity;
  for (let i = w.first; i <= w.last; i++) { lo = Math.min(lo, values[i]!); hi = Math.max(hi, values[i]!); }
  if (!(hi - lo > 1e-14 * Math.max(Math.abs(hi), Math.abs(lo)))) return null;

  const span = time[w.last]! - time[w.first]!;
  const resolution = 1 / span;
  const nyquist = n / (2 * span);
  let df = resolution / SPECTRUM_OVERSAMPLING;
  let count = Math.ceil(nyquist / df);
  let note: string | undefined;
  if (count * n > SPECTRUM_MAX_WORK) {
    // keep two grid points per bin (the sine fit then starts inside the peak's main lobe) and lower the top frequency
    df = resolution / 2;
    count = Math.max(Math.floor(SPECTRUM_MAX_WORK / n), 4);
    if (count * df < nyquist) note = `long record: spectrum shown up to ${(count * df).toPrecision(3)} of ${nyquist.toPrecision(3)} (mean Nyquist frequency)`;
  }
  const t0 = w.from;
  const raw = lombScargle(time, values, w.first, w.last, df, count, t0);
  const frequencies = new Float64Array(count), power = new Float64Array(count);
  let peak = -1;
  for (let k = 0; k < count; k++) {
    frequencies[k] = (k + 1) * df;
    power[k] = (4 * raw[k]!) / n;
    if (frequencies[k]! >= resolution * (1 - 1e-9) && (peak < 0 || power[k]! > power[peak]!)) peak = k;
  }
  if (peak < 0) return null;

  let centre = 0;
  for (let i = w.first; i <= w.last; i++) centre += values[i]!;
  centre /= n;
  const fit = (f: number) => sineFit(time, values, w.first, w.last, f, t0, centre);
  let a = Math.max(frequencies[peak]! - df, 0.5 * resolution), b = frequencies[peak]! + df;
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a), x2 = a + g * (b - a);
  let r1 = fit(x1).residual, r2 = fit(x2).residual;
  while (b - a > 1e-10 * df) {
    if (r1 < r2) { b = x2; x2 = x1; r2 = r1; x1 = b - g * (b - a); r1 = fit(x1).residual; }
    else { a = x1; x1 = x2; r1 = r2; x2 = a + g * (b - a); r2 = fit(x2).residual; }
  }
  const frequency = 0.5 * (a + b);
  const best = fit(frequency);
  const cycles = frequency * span;
  if (cycles < 3 && !note) note = `only ${cycles.toPrecision(2)} cycles in the window: frequency and amplitude are poorly determined`;
  const out: DominantFrequency = {
    frequency, amplitude: best.amplitude, phase: best.phase, offset: centre + best.offset, method: SPECTRUM_METHOD,
    resolution, cycles, from: w.from, to: w.to, frequencies, power,
  };
  if (note) out.note = note;
  return out;
}

/** Least-squares fit x − centre ≈ c + p·cos ωt' + q·sin ωt' (t' = t − t0) at one frequency. */
function sineFit(time: Float64Array, values: Float64Array, first: number, last: number, f: number, t0: number, centre: number) {
  const w = 2 * Math.PI * f;
  let n = 0, sc = 0, ss = 0, scc = 0, scs = 0, sss = 0, sx = 0, sxc = 0, sxs = 0, sxx = 0;
  for (let i = first; i <= last; i++) {
    const ph = w * (time[i]! - t0), c = Math.cos(ph), s = Math.sin(ph), x = values[i]! - centre;
    n++; sc += c; ss += s; scc += c * c; scs += c * s; sss += s * s;
    sx += x; sxc += x * c; sxs += x * s; sxx += x * x;
  }
  // 3×3 normal equations [n sc ss; sc scc scs; ss scs sss]·[c p q] = [sx sxc sxs], by Cramer's rule
  const det = n * (scc * sss - scs * scs) - sc * (sc * sss - scs * ss) + ss * (sc * scs - scc * ss);
  const dc = sx * (scc * sss - scs * scs) - sc * (sxc * sss - scs * sxs) + ss * (sxc * scs - scc * sxs);
  const dp = n * (sxc * sss - sxs * scs) - sx * (sc * sss - scs * ss) + ss * (sc * sxs - sxc * ss);
  const dq = n * (scc * sxs - scs * sxc) - sc * (sc * sxs - sxc * ss) + sx * (sc * scs - scc * ss);
  const c = dc / det, p = dp / det, q = dq / det;
  // residual = Σx² − (c·Σx + p·Σxc + q·Σxs) at the least-squares solution
  const residual = sxx - (c * sx + p * sxc + q * sxs);
  return { offset: c, amplitude: Math.hypot(p, q), phase: Math.atan2(-q, p), residual };
}

/**
 * Strouhal number St = f·L/U (dimensionless) from a frequency (1/s), a reference length (m) and a reference
 * speed (m/s) in consistent units. Throws unless L > 0 and U > 0 are finite and f ≥ 0.
 */
export function strouhalNumber(frequency: number, length: number, speed: number): number {
  if (!(Number.isFinite(frequency) && frequency >= 0)) throw new Error(`Strouhal number: frequency ${frequency} is not a finite non-negative number`);
  if (!(Number.isFinite(length) && length > 0)) throw new Error(`Strouhal number: reference length ${length} is not a positive number`);
  if (!(Number.isFinite(speed) && speed > 0)) throw new Error(`Strouhal number: reference speed ${speed} is not a positive number`);
  return (frequency * length) / speed;
}
