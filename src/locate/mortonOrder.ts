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

/**
 * Sorts `keys` (30-bit codes) ascending and applies the same permutation to `vals`, stably, in three
 * 10-bit passes. `keyB`/`valB` are scratch of the same length (they may be views into a buffer the
 * caller reuses afterwards). The result is left in `keys`/`vals`.
 */
export function radixSort30(keys: Uint32Array, vals: Int32Array, keyB: Uint32Array, valB: Int32Array): void {
  const count = new Int32Array(1025);
  let ka = keys, va = vals, kb = keyB, vb = valB;
  for (let shift = 0; shift < 30; shift += 10) {
    countDigits(ka, shift, count);
    scatter(ka, va, kb, vb, shift, count);
    const tk = ka; ka = kb; kb = tk;
    const tv = va; va = vb; vb = tv;
  }
  // Three passes end in the scratch arrays: copy back.
  keys.set(ka);
  vals.set(va);
}

/** Start of each 10-bit digit value (at `shift`) in the output: exclusive prefix sums in count[0..1023]. */
function countDigits(keys: Uint32Array, shift: number, count: Int32Array): void {
  count.fill(0);
  for (let i = 0, n = keys.length; i < n; i++) count[((keys[i]! >>> shift) & 1023) + 1]++;
  for (let d = 0; d < 1024; d++) count[d + 1] += count[d]!;
}

function scatter(keyA: Uint32Array, valA: Int32Array, keyB: Uint32Array, valB: Int32Array, shift: number, count: Int32Array): void {
  for (let i = 0, n = keyA.length; i < n; i++) {
    const k = keyA[i]!, pos = count[(k >>> shift) & 1023]++;
    keyB[pos] = k; valB[pos] = valA[i]!;
  }
}
