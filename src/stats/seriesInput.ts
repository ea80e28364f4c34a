/**
 * Checks and window selection shared by the statistics of a history (`windowStats.ts`,
 * `transientStart.ts`, `spectrum.ts`): a history is `time` and `values`, two `Float64Array`s of one
 * length, time strictly increasing (steps may be uneven), every number finite. Pure: no DOM.
 */

/** The samples of a history that fall in a time window: indices `first..last` (inclusive). */
export interface WindowRange {
  /** Window start and end actually used (time unit of the history), clamped to the record. */
  from: number;
  to: number;
  /** First and last sample index with from ≤ time ≤ to. */
  first: number;
  last: number;
}

/**
 * Throws a one-line error unless `time`/`values` form a valid history: same length ≥ `minSamples`, finite
 * numbers, time strictly increasing. `who` names the caller and the quantity in the message.
 */
export function checkHistory(who: string, time: Float64Array, values: Float64Array, minSamples = 2): void {
  if (!(time instanceof Float64Array) || !(values instanceof Float64Array)) {
    throw new Error(`${who}: time and values must be Float64Arrays`);
  }
  if (time.length !== values.length) {
    throw new Error(`${who}: time has ${time.length} samples, values has ${values.length}; expected the same count`);
  }
  if (time.length < minSamples) {
    throw new Error(`${who}: ${time.length} samples; at least ${minSamples} expected`);
  }
  for (let i = 0; i < time.length; i++) {
    const t = time[i]!;
    if (!Number.isFinite(t)) throw new Error(`${who}: time[${i}] is ${t}; expected a finite number`);
    if (!Number.isFinite(values[i]!)) throw new Error(`${who}: values[${i}] (time ${t}) is ${values[i]}; expected a finite number`);
    if (i > 0 && !(t > time[i - 1]!)) {
      throw new Error(`${who}: time[${i}] = ${t} does not follow time[${i - 1}] = ${time[i - 1]}; expected strictly increasing times`);
    }
  }
}

/**
 * The window [from, to] clamped to the record, with the indices of the samples inside it. `from`/`to`
 * default to the first/last time. Throws when the window is reversed or holds fewer than `minSamples`.
 */
export function selectWindow(who: string, time: Float64Array, from?: number, to?: number, minSamples = 2): WindowRange {
  const n = time.length;
  const t0 = time[0]!, t1 = time[n - 1]!;
  if (from !== undefined && !Number.isFinite(from)) throw new Error(`${who}: window start ${from} is not a finite time`);
  if (to !== undefined && !Number.isFinite(to)) throw new Error(`${who}: window end ${to} is not a finite time`);
  const a = Math.max(from ?? t0, t0), b = Math.min(to ?? t1, t1);
  if (!(b > a)) {
    throw new Error(`${who}: window [${from ?? t0}, ${to ?? t1}] does not overlap the record [${t0}, ${t1}] with a positive length`);
  }
  const first = lowerBound(time, a);
  let last = lowerBound(time, b);
  if (last >= n || time[last]! > b) last--;
  const samples = last - first + 1;
  if (samples < minSamples) {
    throw new Error(`${who}: window [${a}, ${b}] holds ${Math.max(samples, 0)} samples; at least ${minSamples} expected`);
  }
  return { from: a, to: b, first, last };
}

/** First index i with time[i] ≥ t (n when none). */
export function lowerBound(time: Float64Array, t: number): number {
  let lo = 0, hi = time.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (time[mid]! < t) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/** Value of the piecewise-linear history at time t (t inside the record). */
export function valueAt(time: Float64Array, values: Float64Array, t: number): number {
  const n = time.length;
  const j = lowerBound(time, t);
  if (j <= 0) return values[0]!;
  if (j >= n) return values[n - 1]!;
  const ta = time[j - 1]!, tb = time[j]!;
  const w = (t - ta) / (tb - ta);
  return values[j - 1]! + w * (values[j]! - values[j - 1]!);
}

/**
 * ∫ x dt and ∫ (x − c)² dt over [a, b] by the trapezoid rule on the samples inside, with the history
 * linearly interpolated at a and b when they fall between samples. Returns [∫x dt, ∫(x−c)² dt].
 */
export function trapezoidMoments(time: Float64Array, values: Float64Array, a: number, b: number, c: number): [number, number] {
  let s1 = 0, s2 = 0;
  let tp = a, xp = valueAt(time, values, a);
  let dp = xp - c;
  for (let i = lowerBound(time, a); i < time.length && time[i]! < b; i++) {
    const t = time[i]!;
    if (t <= tp) continue;
    const x = values[i]!, d = x - c, h = t - tp;
    s1 += 0.5 * h * (xp + x);
    s2 += 0.5 * h * (dp * dp + d * d);
    tp = t; xp = x; dp = d;
  }
  const xb = valueAt(time, values, b), db = xb - c, h = b - tp;
  s1 += 0.5 * h * (xp + xb);
  s2 += 0.5 * h * (dp * dp + db * db);
  return [s1, s2];
}
