/**
 * Morton (Z-order) codes of points on a 1024³ lattice, and a stable radix sort of those codes, for
 * ordering cells so that cells near each other in space sit near each other in the tree.
 */

/** MORTON[i]: the 10 bits of i spread to every third bit (bit k → bit 3k). */
export const MORTON = (() => {
  const t = new Uint32Array(1024);
  for (let i = 0; i < 1024; i++) {
    let x = i;
    x = (x | (x << 16)) & 0x030000ff;
    x = (x | (x << 8)) & 0x0300f00f;
    x = (x | (x << 4)) & 0x030c30c3;
    x = (x | (x << 2)) & 0x09249249;
    t[i] = x;
  }
  return t;
})();

/** Lattice step 0..1023 of a coordinate already scaled to −511.5 … 511.5 (clamped). */
export function lattice(v: number): number {
  const q = v + 511.5;
  return q < 0 ? 0 : q > 1023 ? 1023 : q | 0;
}

/** Bits per counting-sort pass: two passes cover the 30-bit codes; 2^15 counters (128 kB) stay in cache. */
const DIGIT = 15, DIGITS = 1 << DIGIT, MASK = DIGITS - 1;

/**
 * Sorts `keys` (30-bit codes) ascending and applies the same permutation to `vals`, stably, in two
 * 15-bit counting-sort passes (linear in the count, no comparisons). `keyB`/`valB` are scratch of the
 * same length (they may be views into a buffer the caller reuses afterwards). Both histograms come from
 * one read of the keys. The result is left in `keys`/`vals`.
 */
export function radixSort30(keys: Uint32Array, vals: Int32Array, keyB: Uint32Array, valB: Int32Array): void {
  const low = new Int32Array(DIGITS + 1), high = new Int32Array(DIGITS + 1);
  countDigits(keys, low, high);
  scatter(keys, vals, keyB, valB, 0, low);
  scatter(keyB, valB, keys, vals, DIGIT, high);
}

/** Start of each digit value in the output, for the low and high 15 bits: exclusive prefix sums. */
function countDigits(keys: Uint32Array, low: Int32Array, high: Int32Array): void {
  for (let i = 0, n = keys.length; i < n; i++) {
    const k = keys[i]!;
    low[(k & MASK) + 1]++;
    high[((k >>> DIGIT) & MASK) + 1]++;
  }
  for (let d = 0; d < DIGITS; d++) { low[d + 1] += low[d]!; high[d + 1] += high[d]!; }
}

function scatter(keyA: Uint32Array, valA: Int32Array, keyB: Uint32Array, valB: Int32Array, shift: number, count: Int32Array): void {
  for (let i = 0, n = keyA.length; i < n; i++) {
    const k = keyA[i]!, pos = count[(k >>> shift) & MASK]++;
    keyB[pos] = k; valB[pos] = valA[i]!;
  }
}
