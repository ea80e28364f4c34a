/**
 * Everything the tools report for one history column in one call: the end of the initial transient
 * (MSER-5, `transientStart.ts`) used as the window start unless the user gave one, the window statistics
 * with the uncertainty of the mean (`windowStats.ts`), the dominant tone (`spectrum.ts`) and its Strouhal
 * number when a reference length and speed are known. Pure: no DOM.
 */
import { dominantFrequency, strouhalNumber, type DominantFrequency } from './spectrum.ts';
import { detectTransientEnd, type TransientEnd } from './transientStart.ts';
import { MIN_WINDOW_SAMPLES, windowStatistics, type WindowStats } from './windowStats.ts';

/** Options of `summarizeHistory`; every field optional. */
export interface HistorySummaryOptions {
  /** Window start (time unit). Default: the detected end of the initial transient. */
  from?: number;
  /** Window end (time unit). Default: the last time. */
  to?: number;
  /** Reference length (m) and speed (m/s) for the Strouhal number; both needed. */
  referenceLength?: number;
  referenceSpeed?: number;
  /** Name of the quantity for error messages, e.g. `drag.Fx [N]`. */
  label?: string;
}

/** Summary of one history over its statistics window. */
export interface HistorySummary {
  /** Detected end of the initial transient (always computed, used only when `from` was not given). */
  transient: TransientEnd;
  /** Where the window start came from. */
  windowSource: 'user' | 'transient-detection';
  stats: WindowStats;
  /** Dominant tone over the same window; null when the window holds < 8 samples or the values are constant. */
  spectrum: DominantFrequency | null;
  /** St = f·L/U of the dominant tone (dimensionless), when reference length and speed were given. */
  strouhal: number | null;
  /** Present when the window had to differ from the detection (too few samples after it). */
  windowNote?: string;
}

/** Transient, statistics and spectrum of one history; throws a one-line error on invalid input. */
export function summarizeHistory(time: Float64Array, values: Float64Array, o: HistorySummaryOptions = {}): HistorySummary {
  const label = o.label ?? 'history';
  const transient = detectTransientEnd(time, values, label);
  let from = o.from ?? transient.time, windowNote: string | undefined;
  // a record with no steady part can leave too few samples after the detected end (uneven steps make it worse)
  const last = Math.min(o.to ?? Infinity, time[time.length - 1]!);
  let after = 0;
  for (let i = 0; i < time.length; i++) if (time[i]! >= from && time[i]! <= last) after++;
  if (o.from === undefined && after < MIN_WINDOW_SAMPLES && time.length >= MIN_WINDOW_SAMPLES) {
    let k = time.length - 1;
    while (k > 0 && time[k]! > last) k--;
    from = time[Math.max(0, k - MIN_WINDOW_SAMPLES + 1)]!;
    windowNote = `the detected transient end (${transient.time}) leaves fewer than ${MIN_WINDOW_SAMPLES} samples: the window starts at ${from} instead`;
  }
  const stats = windowStatistics(time, values, from, o.to, label);
  const spectrum = dominantFrequency(time, values, stats.from, stats.to, label);
  const strouhal = spectrum && o.referenceLength !== undefined && o.referenceSpeed !== undefined
    ? strouhalNumber(spectrum.frequency, o.referenceLength, o.referenceSpeed)
    : null;
  return { transient, windowSource: o.from === undefined ? 'transient-detection' : 'user', stats, spectrum, strouhal, ...(windowNote ? { windowNote } : {}) };
}
