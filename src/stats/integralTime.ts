/**
 * Integral time scale of a history, T_I = ∫₀^∞ ρ(s) ds, from its sample autocorrelation summed with
 * Geyer's initial monotone sequence estimator (Geyer 1992, "Practical Markov chain Monte Carlo",
 * Statistical Science 7(4), §3.3): pairs Γ_m = γ(2m) + γ(2m+1) are summed while they stay positive, each
 * capped by the one before. The variance of a time mean over a record of length T is then σ²·2T_I/T
 * (Bendat & Piersol, Random Data), i.e. T/(2T_I) effectively independent samples.
 *
 * Uneven steps are handled by a stated rule: the window is resampled by linear interpolation onto as many
 * evenly spaced times as it holds samples (same span, the mean step). Pure: no DOM.
 */
import { autocovariance } from './autocovariance.ts';
import { valueAt } from './seriesInput.ts';

/** Result of the integral-time estimate (time unit of the history). */
export interface IntegralTime {
  /** T_I = ∫₀^∞ ρ(s) ds (time unit). */
  integralTime: number;
  /** Record length over the sample spacing: T/(2·T_I), at most the sample count. */
  effectiveSamples: number;
  /** Spacing of the even resampling (time unit). */
  step: number;
  /** Lags summed before the pairs stopped being positive. */
  lags: number;
}

/**
 * Integral time of the history over [from, to] (`count` ≥ 4 even samples are drawn there).
 * A constant history has no fluctuation: integralTime 0 and effectiveSamples = count.
 */
export function integralTimeScale(time: Float64Array, values: Float64Array, from: number, to: number, count: number): IntegralTime {
  const n = Math.max(4, count);
  const step = (to - from) / (n - 1);
  const even = new Float64Array(n);
  for (let i = 0; i < n; i++) even[i] = valueAt(time, values, i === n - 1 ? to : from + i * step);
  const gamma = autocovariance(even);
  const g0 = gamma[0]!;
  if (!(g0 > 0)) return { integralTime: 0, effectiveSamples: n, step, lags: 0 };
  // Geyer's initial monotone sequence: sum Γ_m while positive, each no larger than the one before
  let sum = 0, prev = Infinity, m = 0;
  for (; 2 * m + 1 < n; m++) {
    let pair = gamma[2 * m]! + gamma[2 * m + 1]!;
    if (!(pair > 0)) break;
    if (pair > prev) pair = prev;
    sum += pair;
    prev = pair;
  }
  // τ = 1 + 2Σρ_k (in samples) = −1 + 2ΣΓ_m/γ0; at least one step's worth of a sample
  const tau = Math.min(Math.max(-1 + (2 * sum) / g0, 1 / n), n);
  return { integralTime: 0.5 * tau * step, effectiveSamples: n / tau, step, lags: 2 * m };
}
