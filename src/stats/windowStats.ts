/**
 * Statistics of a history over a time window: time-weighted mean and rms fluctuation (trapezoid rule,
 * steps may be uneven), sample standard deviation, min/max, and the uncertainty of the mean for correlated
 * samples with a 95 % interval from Student's t.
 *
 * Uncertainty of the mean — the rule, stated once:
 * 1. The integral time scale T_I of the window is estimated (Geyer 1992 initial monotone sequence on an
 *    even resampling; `integralTime.ts`).
 * 2. When the window holds at least `MIN_BATCHES` batches each at least `BATCH_INTEGRAL_TIMES`·T_I long and
 *    `MIN_BATCH_SAMPLES` samples, it is split into k = min(`MAX_BATCHES`, that many) non-overlapping batches
 *    of equal duration (Schmeiser 1982, "Batch size effects in the analysis of simulation output",
 *    Operations Research 30(3): 10–30 batches; batches of ≥ 10 T_I keeps their correlation bias near 10 %, common practice). The standard error
 *    is the standard deviation of the batch means over √k, with k − 1 degrees of freedom.
 * 3. Otherwise the effective sample size N_eff = T/(2T_I) (Bayley & Hammersley 1946, "The effective number
 *    of independent observations in an autocorrelated time series", JRSS Suppl. 8(2)) gives the standard
 *    error σ/√N_eff with ⌊N_eff⌋ − 1 degrees of freedom (at least 1), and a note says the window is short.
 * The 95 % half-width is t·SE with t the two-sided Student quantile of those degrees of freedom
 * (`studentT.ts`, Abramowitz & Stegun 26.7.3/26.7.4). Pure: no DOM.
 */
import { integralTimeScale } from './integralTime.ts';
import { checkHistory, selectWindow, trapezoidMoments } from './seriesInput.ts';
import { studentQuantile } from './studentT.ts';

/** Most batches used by the batch-means method (Schmeiser 1982 recommends 10–30). */
export const MAX_BATCHES = 20;
/** Fewest batches for the batch-means method; below it the effective-sample method is used. */
export const MIN_BATCHES = 10;
/** A batch must last at least this many integral time scales (common practice). */
export const BATCH_INTEGRAL_TIMES = 10;
/** A batch must hold at least this many samples. */
export const MIN_BATCH_SAMPLES = 5;
/** Fewest samples in a window for any statistics. */
export const MIN_WINDOW_SAMPLES = 3;

export const BATCH_MEANS_METHOD = 'non-overlapping batch means (Schmeiser 1982)';
export const INTEGRAL_TIME_METHOD = 'effective sample size from the integral time scale (Bayley & Hammersley 1946; T_I by Geyer 1992)';

/** Uncertainty of the time mean (value unit unless said otherwise). */
export interface MeanUncertainty {
  /** Which published method gave the numbers (full name with source). */
  method: string;
  /** Short id of the method. */
  kind: 'batch-means' | 'integral-time';
  /** Standard error of the mean (value unit). */
  standardError: number;
  /** Half-width of the 95 % interval, t·SE (value unit): the mean is mean ± halfWidth95. */
  halfWidth95: number;
  /** Degrees of freedom of the t quantile. */
  degreesOfFreedom: number;
  /** Equivalent number of independent samples: rmsFluctuation²/SE². */
  effectiveSamples: number;
  /** Integral time scale T_I (time unit), Geyer 1992 estimate used by the rule. */
  integralTime: number;
  /** Batches used (batch-means method only). */
  batches?: number;
  /** Why the estimate is weak, when it is. */
  note?: string;
}

/** Statistics of one history over [from, to]. */
export interface WindowStats {
  /** Window used (time unit), clamped to the record. */
  from: number;
  to: number;
  /** Samples with from ≤ time ≤ to. */
  samples: number;
  /** Time-weighted mean (1/T)∫x dt, trapezoid rule, history linear between samples (value unit). */
  mean: number;
  /** Sample standard deviation of the samples in the window, N − 1 denominator (value unit). */
  std: number;
  /** Time-weighted rms of x − mean, √((1/T)∫(x − mean)² dt), trapezoid rule (value unit). */
  rmsFluctuation: number;
  /** Smallest and largest sample in the window (value unit). */
  min: number;
  max: number;
  meanUncertainty: MeanUncertainty;
}

/**
 * Statistics of `values` over the time window [from, to] (defaults: the whole record). `time` strictly
 * increasing, possibly uneven; both Float64Array of one length. `label` names the quantity in errors.
 * Throws a one-line error on invalid input or a window with fewer than 3 samples.
 */
export function windowStatistics(time: Float64Array, values: Float64Array, from?: number, to?: number, label = 'history'): WindowStats {
  const who = `window statistics of ${label}`;
  checkHistory(who, time, values, MIN_WINDOW_SAMPLES);
  const w = selectWindow(who, time, from, to, MIN_WINDOW_SAMPLES);
  const span = w.to - w.from;
  const n = w.last - w.first + 1;

  let min = Infinity, max = -Infinity, sum = 0;
  for (let i = w.first; i <= w.last; i++) {
    const x = values[i]!;
    if (x < min) min = x;
    if (x > max) max = x;
    sum += x;
  }
  const arith = sum / n;
  let ss = 0;
  for (let i = w.first; i <= w.last; i++) ss += (values[i]! - arith) ** 2;
  const std = Math.sqrt(ss / (n - 1));

  const mean = trapezoidMoments(time, values, w.from, w.to, 0)[0] / span;
  const rmsFluctuation = Math.sqrt(Math.max(trapezoidMoments(time, values, w.from, w.to, mean)[1] / span, 0));

  const it = integralTimeScale(time, values, w.from, w.to, n);
  const byTime = it.integralTime > 0 ? Math.floor(span / (BATCH_INTEGRAL_TIMES * it.integralTime)) : MAX_BATCHES;
  const k = Math.min(MAX_BATCHES, byTime, Math.floor(n / MIN_BATCH_SAMPLES));
  const meanUncertainty = k >= MIN_BATCHES
    ? batchMeans(time, values, w.from, span, k, mean, rmsFluctuation, it.integralTime)
    : effectiveSampleSize(span, n, rmsFluctuation, it.integralTime, it.effectiveSamples);
  return { from: w.from, to: w.to, samples: n, mean, std, rmsFluctuation, min, max, meanUncertainty };
}

function batchMeans(time: Float64Array, values: Float64Array, a: number, span: number, k: number, mean: number, rms: number, integralTime: number): MeanUncertainty {
  const len = span / k;
  let ss = 0;
  for (let j = 0; j < k; j++) {
    const lo = a + j * len, hi = j === k - 1 ? a + span : a + (j + 1) * len;
    const bm = trapezoidMoments(time, values, lo, hi, 0)[0] / (hi - lo);
    ss += (bm - mean) ** 2;
  }
  const standardError = Math.sqrt(ss / (k - 1) / k);
  const dof = k - 1;
  return {
    method: `${BATCH_MEANS_METHOD}, ${k} batches`,
    kind: 'batch-means',
    standardError,
    halfWidth95: studentQuantile(0.95, dof) * standardError,
    degreesOfFreedom: dof,
    effectiveSamples: standardError > 0 ? (rms / standardError) ** 2 : Infinity,
    integralTime,
    batches: k,
  };
}

function effectiveSampleSize(span: number, samples: number, rms: number, integralTime: number, resampledEffective: number): MeanUncertainty {
  const nEff = integralTime > 0 ? Math.min(span / (2 * integralTime), resampledEffective) : resampledEffective;
  const standardError = rms / Math.sqrt(nEff);
  const dof = Math.max(1, Math.floor(nEff) - 1);
  const spans = integralTime > 0 ? span / integralTime : Infinity;
  return {
    method: INTEGRAL_TIME_METHOD,
    kind: 'integral-time',
    standardError,
    halfWidth95: studentQuantile(0.95, dof) * standardError,
    degreesOfFreedom: dof,
    effectiveSamples: nEff,
    integralTime,
    note: spans < MIN_BATCHES * BATCH_INTEGRAL_TIMES
      ? `window spans ${spans.toPrecision(3)} integral times (batch means need ${MIN_BATCHES * BATCH_INTEGRAL_TIMES}): the uncertainty is itself uncertain; a longer record is advised`
      : `window holds ${samples} samples (batch means need ${MIN_BATCHES * MIN_BATCH_SAMPLES})`,
  };
}
