/**
 * End of the initial transient of a history, by MSER-5 (White 1997, "An effective truncation heuristic for
 * bias reduction in simulation output", Simulation 69(6); the batch-of-5 form as compared in White, Cobb &
 * Spratt 2000, "A comparison of five steady-state truncation heuristics for simulation", Proc. Winter
 * Simulation Conference): the record is cut into batch means Y_j of `MSER_BATCH` consecutive samples, and
 * the truncation d minimising the marginal standard error
 *     MSER(d) = (1/(b − d)²) Σ_{j ≥ d} (Y_j − Ȳ_d)²,  d ≤ b/2,
 * is chosen; the transient ends at batch d. A minimum at the half-record limit means no steady part was
 * found (the record is too short), and the result says so in its note.
 *
 * Uneven steps, a stated rule: the history is first resampled by linear interpolation onto as many evenly
 * spaced times as it has samples (same span), so every stretch of time weighs the same however finely the
 * solver stepped through it. The returned index is the first original sample at or after that time.
 * Records shorter than `MSER_MIN_BATCHED` samples use batches of 1 (plain MSER). Pure: no DOM.
 */
import { valueAt, checkHistory, lowerBound } from './seriesInput.ts';

/** Samples per batch (MSER-5). */
export const MSER_BATCH = 5;
/** Below this many samples, batches of one sample (plain MSER) are used. */
export const MSER_MIN_BATCHED = 50;
/** Fewest samples for any detection. */
export const MSER_MIN_SAMPLES = 8;

/** Where the initial transient ends. */
export interface TransientEnd {
  /** First sample of the retained part (index into time/values). */
  index: number;
  /** Its time (time unit of the history): use it as the start of the statistics window. */
  time: number;
  /** The method with its source, e.g. "MSER-5 (White 1997)". */
  method: string;
  /** Present when the detection is doubtful (no steady part found, too few samples). */
  note?: string;
}

/**
 * Detects the end of the initial transient of `values` over `time` (Float64Array, strictly increasing,
 * possibly uneven). Throws a one-line error on invalid input; `label` names the quantity in errors.
 */
export function detectTransientEnd(time: Float64Array, values: Float64Array, label = 'history'): TransientEnd {
  checkHistory(`transient detection of ${label}`, time, values, 2);
  const n = time.length;
  if (n < MSER_MIN_SAMPLES) {
    return { index: 0, time: time[0]!, method: 'MSER (White 1997)', note: `only ${n} samples: no truncation (at least ${MSER_MIN_SAMPLES} needed)` };
  }
  const t0 = time[0]!, step = (time[n - 1]! - t0) / (n - 1);
  const batch = n >= MSER_MIN_BATCHED ? MSER_BATCH : 1;
  const b = Math.floor(n / batch);
  const y = new Float64Array(b);
  for (let j = 0; j < b; j++) {
    let s = 0;
    for (let i = j * batch; i < (j + 1) * batch; i++) s += valueAt(time, values, i === n - 1 ? time[n - 1]! : t0 + i * step);
    y[j] = s / batch;
  }
  // centred first: a large offset (a pressure near 101 325 Pa) would swamp the sums of squares
  let centre = 0;
  for (let j = 0; j < b; j++) centre += y[j]!;
  centre /= b;
  for (let j = 0; j < b; j++) y[j] = y[j]! - centre;
  // suffix sums give Σ(Y − Ȳ_d)² for every d in one backward pass
  const limit = Math.floor(b / 2);
  let s1 = 0, s2 = 0, best = Infinity, bestD = 0;
  const stat = new Float64Array(limit + 1);
  for (let j = b - 1; j >= 0; j--) {
    s1 += y[j]!; s2 += y[j]! * y[j]!;
    if (j > limit) continue;
    const m = b - j;
    stat[j] = Math.max(s2 - (s1 * s1) / m, 0) / (m * m);
  }
  for (let d = 0; d <= limit; d++) if (stat[d]! < best) { best = stat[d]!; bestD = d; }
  const cut = t0 + bestD * batch * step;
  const index = Math.min(lowerBound(time, cut - 1e-12 * Math.max(Math.abs(cut), step)), n - 1);
  const method = batch > 1 ? `MSER-${batch} (White 1997)` : 'MSER (White 1997)';
  const result: TransientEnd = { index, time: time[index]!, method };
  if (bestD >= limit - 1 && limit > 1) {
    result.note = 'the minimum lies at the half-record limit: no steady part found; the record may be too short or still drifting';
  }
  return result;
}
