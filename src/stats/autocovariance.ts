/**
 * Biased sample autocovariance γ(k) = (1/N) Σ_{i<N−k} (x_i − x̄)(x_{i+k} − x̄), k = 0…N−1, of an evenly
 * sampled series, through a zero-padded radix-2 FFT (Wiener–Khinchin: |X|² transformed back), so long
 * records cost O(N log N). Pure: no DOM.
 */

/** Autocovariance at every lag 0…N−1 (value unit squared). */
export function autocovariance(x: Float64Array): Float64Array {
  const n = x.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  let size = 1;
  while (size < 2 * n) size *= 2;
  const re = new Float64Array(size), im = new Float64Array(size);
  for (let i = 0; i < n; i++) re[i] = x[i]! - mean;
  fft(re, im, false);
  for (let i = 0; i < size; i++) { re[i] = re[i]! * re[i]! + im[i]! * im[i]!; im[i] = 0; }
  fft(re, im, true);
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) out[k] = re[k]! / (size * n);
  return out;
}

/** In-place iterative radix-2 complex FFT (length a power of two); `inverse` gives the unscaled inverse. */
export function fft(re: Float64Array, im: Float64Array, inverse: boolean): void {
  const n = re.length;
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      const tr = re[i]!; re[i] = re[j]!; re[j] = tr;
      const ti = im[i]!; im[i] = im[j]!; im[j] = ti;
    }
  }
  const sign = inverse ? 1 : -1;
  for (let len = 2; len <= n; len <<= 1) {
    const half = len >> 1;
    const ang = (sign * 2 * Math.PI) / len;
    for (let k = 0; k < half; k++) {
      const wr = Math.cos(ang * k), wi = Math.sin(ang * k);
      for (let s = k; s < n; s += len) {
        const t = s + half;
        const xr = re[t]! * wr - im[t]! * wi, xi = re[t]! * wi + im[t]! * wr;
        re[t] = re[s]! - xr; im[t] = im[s]! - xi;
        re[s] = re[s]! + xr; im[s] = im[s]! + xi;
      }
    }
  }
}
