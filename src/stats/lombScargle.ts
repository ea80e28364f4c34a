/**
 * Lomb–Scargle periodogram of an unevenly sampled series (Lomb 1976, "Least-squares frequency analysis of
 * unequally spaced data", Astrophys. Space Sci. 39; Scargle 1982, "Studies in astronomical time series
 * analysis II", ApJ 263, eq. 10 with the time offset τ of eq. 11), on the frequency grid f_k = k·df,
 * k = 1…count. Sines and cosines of every sample step through the grid by rotation, so the cost is
 * O(samples × frequencies) multiply-adds with one sine and cosine per sample. Pure: no DOM.
 */

/**
 * Power P(f_k) in Scargle's normalisation (value unit²; a sinusoid of amplitude A over N samples peaks near
 * N·A²/4) of the samples first…last, their arithmetic mean removed. `t0` is subtracted from every time.
 */
export function lombScargle(time: Float64Array, values: Float64Array, first: number, last: number, df: number, count: number, t0: number): Float64Array {
  const n = last - first + 1;
  let mean = 0;
  for (let i = first; i <= last; i++) mean += values[i]!;
  mean /= n;
  const yc = new Float64Array(count), ys = new Float64Array(count);
  const c2 = new Float64Array(count), s2 = new Float64Array(count);
  for (let i = first; i <= last; i++) {
    const y = values[i]! - mean;
    const a = 2 * Math.PI * df * (time[i]! - t0);
    const ca = Math.cos(a), sa = Math.sin(a);
    let c = ca, s = sa;
    for (let k = 0; k < count; k++) {
      yc[k] += y * c;
      ys[k] += y * s;
      c2[k] += c * c - s * s;
      s2[k] += 2 * c * s;
      const cn = c * ca - s * sa;
      s = s * ca + c * sa;
      c = cn;
    }
  }
  const power = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    // 2ωτ = atan2(Σsin 2ωt, Σcos 2ωt) makes the cosine and sine terms orthogonal
    const phi = Math.atan2(s2[k]!, c2[k]!);
    const cp = Math.cos(phi), sp = Math.sin(phi);
    const ct = Math.sqrt(0.5 * (1 + cp)), st = (sp >= 0 ? 1 : -1) * Math.sqrt(Math.max(0.5 * (1 - cp), 0));
    const cc = 0.5 * n + 0.5 * (c2[k]! * cp + s2[k]! * sp);
    const ss = n - cc;
    const a = yc[k]! * ct + ys[k]! * st, b = ys[k]! * ct - yc[k]! * st;
    power[k] = 0.5 * ((cc > 0 ? (a * a) / cc : 0) + (ss > 0 ? (b * b) / ss : 0));
  }
  return power;
}
